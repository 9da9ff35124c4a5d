import { assembliesPhrase, NoticeEmail, type NoticeEmailProps, type NoticeWording } from "./notice-shared";

/** First reminder, before the due date. */
export function reminderWording(props: NoticeEmailProps): NoticeWording {
  const only = props.items.length === 1 ? props.items[0] : undefined;
  const checkWord = only?.checkWord ?? "test";
  return {
    subject: only ? `Backflow ${checkWord} due by ${only.dueOn}: ${only.site}` : `Backflow tests due soon: ${props.items.length} assemblies`,
    preview: only ? `The yearly ${checkWord} is due by ${only.dueOn}.` : `${props.items.length} assemblies are due for their yearly test.`,
    headline: only ? `Yearly backflow ${checkWord} due by ${only.dueOn}` : "Yearly backflow tests due soon",
    intro: [
      `${props.programName}'s records show that ${assembliesPhrase(props.items)} below ${props.items.length === 1 ? "is" : "are"} due for the yearly field ${checkWord} soon. Every assembly must be tested at least once a year by a certified tester, who files the report with the program.`,
    ],
    action: [
      "Please book a certified backflow assembly tester in good time before the date shown. The tester files the report with us; you do not need to send anything yourself.",
      "If the test was done in the last few days, thank you: the report may still be on its way, and you can ignore this reminder.",
    ],
  };
}

export function subjectOfNoticeReminder(props: NoticeEmailProps): string {
  return reminderWording(props).subject;
}

/** Render through lib/data/notices-render, which checks every variable first (parseNoticeProps). */
export default function NoticeReminderEmail(props: NoticeEmailProps) {
  return <NoticeEmail props={props} wording={reminderWording(props)} kind="reminder" />;
}
