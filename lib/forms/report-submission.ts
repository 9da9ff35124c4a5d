// The shape of a submitted field-test report (POST /api/reports), one zod schema for the form
// and the server. Readings are in the program's unit; an opening point that never came is the
// word "did_not_open", never a number. Pure.
import { z } from "zod";
import { isIsoDate } from "@/lib/rules";
import { repairActions, repairComponents, repairParts } from "./repairs";

export { installationKinds, installationLabels, reasonLabels, testReasons, type TestReason } from "./report-options";
import { installationKinds, testReasons } from "./report-options";

/** A client's key for one submission or one draft: random, URL-safe. */
export const clientKeySchema = z.string().regex(/^[A-Za-z0-9_-]{16,64}$/, { message: "The form's key is malformed; reload the page." });

const hasAtMostDecimals = (value: number, decimals: number) => Math.abs(Math.round(value * 10 ** decimals) - value * 10 ** decimals) < 1e-6;

const differential = z
  .number({ message: "Enter the reading as a number." })
  .finite({ message: "Enter the reading as a number." })
  .min(0, { message: "A differential gauge reads from 0: a reading cannot be negative." })
  .refine((v) => hasAtMostDecimals(v, 1), { message: "One decimal place, as the gauge is read." });

const openingPoint = z.union([differential, z.literal("did_not_open")], { message: 'Enter the opening point, or "did_not_open".' });

const inches = z
  .number({ message: "Enter the measurement in inches." })
  .finite({ message: "Enter the measurement in inches." })
  .min(0, { message: "A measurement cannot be negative." })
  .max(1000, { message: "More than 1000 inches: check the measurement." })
  .refine((v) => hasAtMostDecimals(v, 2), { message: "Two decimal places at most." });

export const readingsSchema = z
  .object({
    reliefValveOpeningPoint: openingPoint.optional(),
    check1Differential: differential.optional(),
    check1ClosedTight: z.boolean().optional(),
    check2Differential: differential.optional(),
    check2ClosedTight: z.boolean().optional(),
    shutoff2Tight: z.boolean().optional(),
    airInletOpeningPoint: openingPoint.optional(),
    airInletFullyOpen: z.boolean().optional(),
    checkDifferential: differential.optional(),
    checkClosedTight: z.boolean().optional(),
    supplyPipeDiameterInches: inches.optional(),
    airGapInches: inches.optional(),
    nearSideWall: z.boolean().optional(),
  })
  .strict();
export type SubmittedReadings = z.infer<typeof readingsSchema>;

export const repairRowSchema = z.object({
  component: z.enum(repairComponents, { message: "Pick the component that was repaired." }),
  part: z.enum(repairParts, { message: "Pick the part from the list." }),
  action: z.enum(repairActions, { message: "Say whether the part was cleaned or replaced." }),
  note: z.string().trim().max(300, { message: "Keep the note under 300 characters." }).default(""),
});

const isoDate = z.string().refine(isIsoDate, { message: "Enter a date (YYYY-MM-DD)." });
const id = z.number({ message: "Missing." }).int().positive();

export const reportSubmissionSchema = z
  .object({
    idempotencyKey: clientKeySchema,
    /** The draft this submission comes from: removed in the same transaction. */
    draftKey: clientKeySchema.optional(),
    assemblyId: id,
    kitId: z.number({ message: "Pick the test kit you used." }).int().positive({ message: "Pick the test kit you used." }),
    testedOn: isoDate,
    testedTime: z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, { message: "Enter the time of the test (HH:MM)." }),
    reason: z.enum(testReasons, { message: "Say why the assembly was tested." }),
    reasonNote: z.string().trim().max(300, { message: "Keep it under 300 characters." }).default(""),
    installation: z.enum(installationKinds).default("existing"),
    previousSerial: z.string().trim().max(60, { message: "A serial number is at most 60 characters." }).default(""),
    orientationApproved: z.boolean().nullable().default(null),
    reliefPortAirGapOk: z.boolean().nullable().default(null),
    /** The unit the readings were typed in; must be the program's. */
    unit: z.enum(["psid", "kPa"]),
    /** Static line pressure in the program's unit (psi or kPa). */
    linePressure: z.number({ message: "Enter the line pressure as a number." }).finite().positive({ message: "The line pressure must be more than 0." }).max(2000, { message: "That line pressure is not plausible: check it." }).nullable().default(null),
    initial: readingsSchema,
    repairs: z.array(repairRowSchema).max(60).default([]),
    retest: readingsSchema.nullable().default(null),
    remarks: z.string().trim().max(2000, { message: "Keep the remarks under 2000 characters." }).default(""),
    attestation: z.object({
      name: z.string().trim().min(1, { message: "Type your name to sign the report." }).max(120),
      confirmed: z.literal(true, { message: "Confirm that the readings are true and were taken by you." }),
    }),
    /** A returned report this one corrects (same report number, next revision). */
    correctsReportId: id.nullable().default(null),
    /** An accepted report this one amends (a new report linked to it). */
    amendsReportId: id.nullable().default(null),
  })
  .superRefine((value, context) => {
    if (value.reason === "other" && value.reasonNote === "") context.addIssue({ code: "custom", path: ["reasonNote"], message: "Say what the reason was." });
    if (value.installation === "replacement" && value.previousSerial === "") context.addIssue({ code: "custom", path: ["previousSerial"], message: "Give the serial of the assembly this one replaces." });
    if (value.correctsReportId !== null && value.amendsReportId !== null) context.addIssue({ code: "custom", path: ["amendsReportId"], message: "A report either corrects a returned report or amends an accepted one, not both." });
    if (value.retest !== null && value.repairs.length === 0) context.addIssue({ code: "custom", path: ["repairs"], message: "Record what was repaired before the retest." });
    if (value.retest === null && value.repairs.length > 0) context.addIssue({ code: "custom", path: ["retest"], message: "Record the retest readings after the repair." });
  });

export type ReportSubmission = z.output<typeof reportSubmissionSchema>;
export type ReportSubmissionInput = z.input<typeof reportSubmissionSchema>;
