import { Button, Link, Section, Text } from "@react-email/components";
import type { ReactNode } from "react";
import { z } from "zod";
import { buttonStyle, EmailLayout, smallStyle, textStyle } from "./components/email-layout";

/**
 * What every owner notice says, whatever its stage. Each value arrives ready to print (dates
 * already written out) and is checked before anything renders: a notice with a missing value
 * is never sent.
 */
const text = (what: string) => z.string({ error: `${what} is missing.` }).trim().min(1, `${what} is missing.`);
const absoluteUrl = (what: string) =>
  z
    .string({ error: `${what} is missing.` })
    .trim()
    .refine((value) => /^https?:\/\/[^\s/]+/.test(value), `${what} must be an absolute http(s) address.`);

export const noticeItemSchema = z.object({
  /** "Reduced pressure principle assembly (RP), Tallowmere TR-4, 1 in, serial TA123456". */
  assembly: text("The assembly's description"),
  /** "kitchen branch line". */
  location: text("The assembly's location"),
  /** "Hearthside Restaurant, 477 Mossgate Avenue, Quillmere". */
  site: text("The site's address"),
  accountNumber: text("The site's account number"),
  /** "test" or "inspection" (an air gap is inspected, not gauge-tested). */
  checkWord: z.enum(["test", "inspection"], { error: "The kind of check is missing." }),
  /** The due date the notice is about, written out: "3 March 2026". */
  dueOn: text("The due date"),
  /** Repair reminders: when the assembly failed, and the repair deadline. */
  failedOn: z.string().trim().optional(),
});

export const noticeEmailSchema = z.object({
  programName: text("The program's name"),
  programPhone: text("The program's phone number"),
  programReplyTo: z.email({ error: "The program's reply-to address is missing or invalid." }),
  programAddress: text("The program's mailing address"),
  recipientName: text("The recipient's name"),
  /** The day the notice went out, written out. */
  noticeDate: text("The notice date"),
  items: z.array(noticeItemSchema, { error: "The list of assemblies is missing." }).min(1, "A notice needs at least one assembly."),
  /** Where the owner sees their assemblies: a single-use sign-in link, or the plain sign-in page. */
  portalUrl: absoluteUrl("The portal link"),
  isSignedLink: z.boolean({ error: "Whether the portal link signs in is missing." }),
  /** When the signed link stops working, written out (signed links only). */
  linkExpiresOn: z.string().trim(),
  testersUrl: absoluteUrl("The link to the tester roster"),
  /** Final notices: the date after which service may be discontinued, written out. */
  discontinueOn: z.string().trim().optional(),
});

export type NoticeItem = z.infer<typeof noticeItemSchema>;
export type NoticeEmailProps = z.infer<typeof noticeEmailSchema>;

/** The notice stages, as the notices table names them. */
export type NoticeTemplateKind = "reminder" | "overdue" | "final" | "repair_reminder";

/** What one stage says, as plain strings: the e-mail renders them and the printed letter prints them. */
export interface NoticeWording {
  subject: string;
  preview: string;
  /** A short heading line, e.g. "Final notice". */
  headline: string;
  /** Paragraphs before the list of assemblies. */
  intro: string[];
  /** Paragraphs after it: what to do. */
  action: string[];
  /** A safety or rules caution, printed apart. */
  caution?: string;
}

export class NoticeTemplateError extends Error {
  constructor(
    public readonly kind: NoticeTemplateKind,
    public readonly problems: string[],
  ) {
    super(`The ${kind.replace("_", " ")} notice cannot be written: ${problems.join(" ")}`);
    this.name = "NoticeTemplateError";
  }
}

/** Checks every variable of a notice; throws NoticeTemplateError naming each missing one. */
export function parseNoticeProps(kind: NoticeTemplateKind, value: unknown): NoticeEmailProps {
  const result = noticeEmailSchema.safeParse(value);
  const problems = result.success ? [] : result.error.issues.map((issue) => `${issue.path.length ? `${issue.path.join(".")}: ` : ""}${issue.message}`);
  if (result.success && result.data.isSignedLink && !result.data.linkExpiresOn) problems.push("linkExpiresOn: The expiry of the sign-in link is missing.");
  if (result.success && kind === "final" && !result.data.discontinueOn) problems.push("discontinueOn: The date after which service may be discontinued is missing.");
  if (result.success && kind === "repair_reminder" && result.data.items.some((item) => !item.failedOn)) problems.push("items.failedOn: The date of the failed test is missing.");
  if (problems.length > 0 || !result.success) throw new NoticeTemplateError(kind, problems);
  return result.data;
}

/** "the assembly" / "the 3 assemblies", for sentences that cover the whole list. */
export function assembliesPhrase(items: readonly NoticeItem[]): string {
  return items.length === 1 ? "the backflow prevention assembly" : `the ${items.length} backflow prevention assemblies`;
}

/** The legal footer: why the message was sent. Compliance notices are not marketing, so there is nothing to unsubscribe from. */
export function noticeFooter(props: Pick<NoticeEmailProps, "programName" | "programAddress">): string {
  return `${props.programName} sends this notice under its cross-connection control program, which requires backflow prevention assemblies to be tested so that water from private plumbing cannot flow back into the public supply. It is an official compliance notice about the water service at your property, not marketing, and it goes to the contact the program has on file for the property. ${props.programAddress}.`;
}

const itemBox = { border: "1px solid #d9e0dd", borderRadius: "6px", padding: "10px 14px", margin: "0 0 10px" };
const itemTitle = { color: "#1c2423", fontSize: "15px", fontWeight: 600, lineHeight: "22px", margin: "0 0 2px" };
const itemLine = { color: "#2f3837", fontSize: "14px", lineHeight: "20px", margin: 0 };
const headlineStyle = { color: "#0e5a63", fontSize: "20px", fontWeight: 700, lineHeight: "28px", margin: "0 0 14px" };
const cautionStyle = { backgroundColor: "#fff7e6", border: "1px solid #e8c27a", borderRadius: "6px", color: "#7f4900", fontSize: "14px", lineHeight: "20px", margin: "0 0 14px", padding: "10px 14px" };

function AssemblyList({ items, kind }: { items: readonly NoticeItem[]; kind: NoticeTemplateKind }) {
  return (
    <Section style={{ margin: "4px 0 16px" }}>
      {items.map((item, index) => (
        <Section key={index} style={itemBox}>
          <Text style={itemTitle}>{item.assembly}</Text>
          <Text style={itemLine}>Location: {item.location}</Text>
          <Text style={itemLine}>
            Site: {item.site} (account {item.accountNumber})
          </Text>
          {kind === "repair_reminder" ? (
            <Text style={itemLine}>
              Failed its {item.checkWord} on {item.failedOn}; repair and retest due by {item.dueOn}
            </Text>
          ) : (
            <Text style={itemLine}>
              Yearly {item.checkWord} {kind === "reminder" ? "due by" : "was due on"} {item.dueOn}
            </Text>
          )}
        </Section>
      ))}
    </Section>
  );
}

/** The body every notice e-mail shares: greeting, the stage's wording, the list, links and contact. */
export function NoticeEmail({ props, wording, kind }: { props: NoticeEmailProps; wording: NoticeWording; kind: NoticeTemplateKind }): ReactNode {
  return (
    <EmailLayout preview={wording.preview} senderName={props.programName} footer={noticeFooter(props)}>
      <Text style={headlineStyle}>{wording.headline}</Text>
      <Text style={textStyle}>Dear {props.recipientName},</Text>
      {wording.intro.map((paragraph, index) => (
        <Text key={`intro-${index}`} style={textStyle}>
          {paragraph}
        </Text>
      ))}
      <AssemblyList items={props.items} kind={kind} />
      {wording.action.map((paragraph, index) => (
        <Text key={`action-${index}`} style={textStyle}>
          {paragraph}
        </Text>
      ))}
      {wording.caution ? <Text style={cautionStyle}>{wording.caution}</Text> : null}
      <Button href={props.portalUrl} style={buttonStyle}>
        See your assemblies
      </Button>
      {props.isSignedLink ? (
        <Text style={{ ...smallStyle, marginTop: "12px" }}>
          This button signs you in to your property&apos;s page without a password. It works once and until {props.linkExpiresOn}; do not forward this e-mail. Or open this address: {props.portalUrl}
        </Text>
      ) : (
        <Text style={{ ...smallStyle, marginTop: "12px" }}>Or open this address and sign in: {props.portalUrl}</Text>
      )}
      <Text style={textStyle}>
        Find a tester certified to work in this program: <Link href={props.testersUrl}>{props.testersUrl}</Link>
      </Text>
      <Text style={smallStyle}>
        Questions about this notice? Reply to this e-mail ({props.programReplyTo}) or call {props.programPhone}. Notice dated {props.noticeDate}.
      </Text>
    </EmailLayout>
  );
}
