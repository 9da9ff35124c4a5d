// The server's check of a saved field-test draft before it is stored. The browser uses the
// hand-written twin, parseDraft in ./field-test-draft (same limits; a unit test compares them).
import { z } from "zod";
import { repairActions, repairComponents, repairParts } from "./repairs";
import { installationKinds, testReasons } from "./report-options";

const fieldRecord = <T extends z.ZodType>(value: T) => z.record(z.string().max(40), value);
const phaseSchema = z.object({
  text: fieldRecord(z.string().max(20)),
  flags: fieldRecord(z.boolean()),
  didNotOpen: fieldRecord(z.boolean()),
});
const id = () => z.number().int().positive();

/** What a saved draft may hold. */
export const fieldTestDraftSchema = z.object({
  v: z.literal(1),
  assemblyId: id(),
  kind: z.enum(["RP", "RPDA", "DC", "DCDA", "PVB", "SVB", "AG"]),
  unit: z.enum(["psid", "kPa"]),
  correctsReportId: id().nullable(),
  amendsReportId: id().nullable(),
  kitId: id().nullable(),
  testedOn: z.string().max(10),
  testedTime: z.string().max(5),
  reason: z.enum([...testReasons, ""]),
  reasonNote: z.string().max(300),
  installation: z.enum(installationKinds),
  previousSerial: z.string().max(60),
  orientationApproved: z.boolean().nullable(),
  reliefPortAirGapOk: z.boolean().nullable(),
  linePressure: z.string().max(20),
  initial: phaseSchema,
  repairChoice: z.enum(["repaired", "not_repaired"]).nullable(),
  repairs: z
    .array(
      z.object({
        component: z.enum(repairComponents),
        parts: z.partialRecord(z.enum(repairParts), z.enum(repairActions)),
        note: z.string().max(300),
      }),
    )
    .max(12),
  retest: phaseSchema,
  remarks: z.string().max(2000),
  attestationName: z.string().max(120),
  attestationConfirmed: z.boolean(),
});
