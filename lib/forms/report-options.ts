// The fixed choices of a field-test report (reasons, installation kinds) and their words.
// Kept apart from the zod schema so the browser's form can use them without loading zod. Pure.
export const testReasons = ["annual", "installation", "repair", "relocation", "incident", "other"] as const;
export type TestReason = (typeof testReasons)[number];
export const reasonLabels: Readonly<Record<TestReason, string>> = Object.freeze({
  annual: "Annual test",
  installation: "New installation",
  repair: "After repair",
  relocation: "Relocation or reinstallation",
  incident: "After a backflow incident",
  other: "Other",
});

export const installationKinds = ["existing", "new", "replacement"] as const;
export const installationLabels: Readonly<Record<(typeof installationKinds)[number], string>> = Object.freeze({
  existing: "Existing assembly",
  new: "New installation",
  replacement: "Replaces another assembly",
});
