// The browser's hand-written draft check and the server's zod schema agree on every draft:
// valid ones, and the same drafts with one field knocked out of shape.
import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { newDraft, parseDraft, type FieldTestDraft } from "@/lib/forms/field-test-draft";
import { fieldTestDraftSchema } from "@/lib/forms/field-test-draft-schema";

const base = (): FieldTestDraft => {
  const draft = newDraft({ assemblyId: 7, kind: "RP", unit: "psid", testedOn: "2026-11-30", testedTime: "10:42", kitId: 1, reason: "annual" });
  draft.initial.text = { reliefValveOpeningPoint: "2.6", check1Differential: "6.1" };
  draft.initial.flags = { check2ClosedTight: true };
  draft.repairs = [{ component: "check1", parts: { disc_rubber: "replaced" }, note: "" }];
  return draft;
};

const odd = fc.oneof(
  fc.constant(undefined),
  fc.constant(null),
  fc.integer({ min: -5, max: 5 }),
  fc.double(),
  fc.boolean(),
  fc.string({ maxLength: 30 }),
  fc.constant("x".repeat(2500)),
  fc.array(fc.string(), { maxLength: 3 }),
  fc.dictionary(fc.string({ maxLength: 45 }), fc.oneof(fc.string({ maxLength: 25 }), fc.boolean()), { maxKeys: 3 }),
  fc.constantFrom("RP", "psid", "annual", "existing", "repaired", "check1", "2026-12-01"),
);
const keys = Object.keys(base()) as (keyof FieldTestDraft)[];

describe("draft checks in the browser and on the server", () => {
  test("a well-formed draft passes both", () => {
    expect(parseDraft(base())).not.toBeNull();
    expect(fieldTestDraftSchema.safeParse(base()).success).toBe(true);
  });

  test("one field out of shape: both say the same", () => {
    fc.assert(
      fc.property(fc.constantFrom(...keys), odd, (key, value) => {
        const draft = { ...base(), [key]: value } as Record<string, unknown>;
        if (value === undefined) delete draft[key];
        expect(parseDraft(draft) !== null).toBe(fieldTestDraftSchema.safeParse(draft).success);
      }),
      { numRuns: 2000, seed: 7 },
    );
  });

  test("nested pieces out of shape: both say the same", () => {
    fc.assert(
      fc.property(fc.constantFrom("initial.text", "initial.flags", "retest.didNotOpen", "repairs.0.parts", "repairs.0.component", "repairs.0.note"), odd, (path, value) => {
        const draft = structuredClone(base()) as unknown as Record<string, Record<string, unknown>>;
        const [head, second, third] = path.split(".");
        if (third) (draft[head!] as unknown as Record<string, Record<string, unknown>>)[second!]![third] = value;
        else draft[head!]![second!] = value;
        expect(parseDraft(draft) !== null).toBe(fieldTestDraftSchema.safeParse(draft).success);
      }),
      { numRuns: 2000, seed: 11 },
    );
  });
});
