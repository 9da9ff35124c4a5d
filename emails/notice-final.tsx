import { assembliesPhrase, NoticeEmail, type NoticeEmailProps, type NoticeWording } from "./notice-shared";

/** Final notice: names the date after which the program may discontinue water service. */
export function finalWording(props: NoticeEmailProps): NoticeWording {
  const only = props.items.length === 1 ? props.items[0] : undefined;
  const checkWord = only?.checkWord ?? "test";
  const discontinueOn = props.discontinueOn ?? "";
  return {
    subject: only ? `Final notice: backflow ${checkWord} overdue at ${only.site}; service may be discontinued after ${discontinueOn}` : `Final notice: ${props.items.length} backflow assemblies overdue; service may be discontinued after ${discontinueOn}`,
    preview: `Final notice: have the ${checkWord} done and filed by ${discontinueOn}.`,
    headline: "Final notice",
    intro: [
      `This is the final notice about ${assembliesPhrase(props.items)} below. The yearly field ${checkWord} is overdue and no passing test is on file with ${props.programName}.`,
      `If no passing test report is on file by ${discontinueOn}, ${props.programName} may discontinue water service to the property, as its cross-connection control rules allow.`,
    ],
    action: [
      `Please have a certified backflow assembly tester test ${props.items.length === 1 ? "it" : "them"} now; the tester files the report with us. If you have already booked a test, or you need more time, contact us before ${discontinueOn}.`,
      "If the test was done in the last few days, thank you: the report may still be on its way.",
    ],
    caution: "Discontinuing service is a last resort. The program's rules and local codes govern when and how it may happen; contact the program office with any question.",
  };
}

export function subjectOfNoticeFinal(props: NoticeEmailProps): string {
  return finalWording(props).subject;
}

/** Render through lib/data/notices-render, which checks every variable first (parseNoticeProps). */
export default function NoticeFinalEmail(props: NoticeEmailProps) {
  return <NoticeEmail props={props} wording={finalWording(props)} kind="final" />;
}
