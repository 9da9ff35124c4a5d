import { assembliesPhrase, NoticeEmail, type NoticeEmailProps, type NoticeWording } from "./notice-shared";

/** Overdue notice: the due date has passed without a passing test on file. */
export function overdueWording(props: NoticeEmailProps): NoticeWording {
  const only = props.items.length === 1 ? props.items[0] : undefined;
  const checkWord = only?.checkWord ?? "test";
  return {
    subject: only ? `Overdue: backflow ${checkWord} was due on ${only.dueOn}: ${only.site}` : `Overdue: ${props.items.length} backflow assemblies need their yearly test`,
    preview: only ? `The yearly ${checkWord} was due on ${only.dueOn} and no passing test is on file.` : "The yearly tests are overdue.",
    headline: only ? `Overdue: the yearly ${checkWord} was due on ${only.dueOn}` : "Overdue: yearly backflow tests",
    intro: [
      `The yearly field ${checkWord} of ${assembliesPhrase(props.items)} below is overdue: no passing test is on file with ${props.programName}. An assembly that is not tested may fail without anyone knowing, and then it no longer protects the public water supply.`,
    ],
    action: [
      "Please have a certified backflow assembly tester test it as soon as possible. The tester files the report with us; if the assembly fails, it can usually be repaired and retested on the same visit.",
      "If the test was done in the last few days, thank you: the report may still be on its way, and you can ignore this notice.",
    ],
  };
}

export function subjectOfNoticeOverdue(props: NoticeEmailProps): string {
  return overdueWording(props).subject;
}

/** Render through lib/data/notices-render, which checks every variable first (parseNoticeProps). */
export default function NoticeOverdueEmail(props: NoticeEmailProps) {
  return <NoticeEmail props={props} wording={overdueWording(props)} kind="overdue" />;
}
