import { assembliesPhrase, NoticeEmail, type NoticeEmailProps, type NoticeWording } from "./notice-shared";

/** Repair reminder: an assembly failed its test and its repair deadline is near. */
export function repairReminderWording(props: NoticeEmailProps): NoticeWording {
  const only = props.items.length === 1 ? props.items[0] : undefined;
  return {
    subject: only ? `Repair reminder: failed backflow assembly at ${only.site} must be repaired and retested by ${only.dueOn}` : `Repair reminder: ${props.items.length} failed backflow assemblies must be repaired and retested`,
    preview: only ? `Repair and retest due by ${only.dueOn}.` : "Repairs and retests are due soon.",
    headline: only ? `Repair and retest due by ${only.dueOn}` : "Repairs and retests due soon",
    intro: [
      `${assembliesPhrase(props.items).replace(/^the/, "The")} below failed ${props.items.length === 1 ? "its" : "their"} field test. Until ${props.items.length === 1 ? "it is" : "they are"} repaired and pass a retest, the assembly may not protect the public water supply, so ${props.programName} sets a deadline for the repair.`,
    ],
    action: [
      "Please have a certified backflow assembly tester or a licensed plumber repair the assembly and have it retested before the deadline. The tester files the retest report with us.",
      "If the repair and retest were done in the last few days, thank you: the report may still be on its way.",
    ],
    caution: "Repairs mean shutting off the building's water and opening spring-loaded parts under pressure. They are work for a certified tester or licensed plumber, following the assembly maker's instructions and local codes.",
  };
}

export function subjectOfNoticeRepairReminder(props: NoticeEmailProps): string {
  return repairReminderWording(props).subject;
}

/** Render through lib/data/notices-render, which checks every variable first (parseNoticeProps). */
export default function NoticeRepairReminderEmail(props: NoticeEmailProps) {
  return <NoticeEmail props={props} wording={repairReminderWording(props)} kind="repair_reminder" />;
}
