import { Button, Text } from "@react-email/components";
import { buttonStyle, EmailLayout, textStyle } from "./components/email-layout";

export type RegistrationDecision = "approved" | "rejected" | "suspended" | "reinstated" | "received";

export interface TesterRegistrationDecisionEmailProps {
  name: string;
  programName: string;
  decision: RegistrationDecision;
  reason?: string | null;
  signInUrl: string;
}

const headlines: Record<RegistrationDecision, (program: string) => string> = {
  received: (p) => `${p} has received your tester registration`,
  approved: (p) => `You are approved to file tests with ${p}`,
  rejected: (p) => `${p} could not approve your tester registration`,
  suspended: (p) => `Your filing privileges with ${p} are suspended`,
  reinstated: (p) => `Your filing privileges with ${p} are restored`,
};

export function subjectOfTesterRegistrationDecision(props: Pick<TesterRegistrationDecisionEmailProps, "programName" | "decision">): string {
  return headlines[props.decision](props.programName);
}

export default function TesterRegistrationDecisionEmail({ name, programName, decision, reason, signInUrl }: TesterRegistrationDecisionEmailProps) {
  const body: Record<RegistrationDecision, string> = {
    received: "An inspector will check your certificate and decide on your registration. You can already sign in to add your test kits and documents.",
    approved: "You can now file field-test reports for assemblies in this program.",
    rejected: "Your registration was not approved. You can correct your details and ask again.",
    suspended: "Until this is resolved you cannot file reports in this program. Reports already filed are kept.",
    reinstated: "You can file field-test reports in this program again.",
  };
  return (
    <EmailLayout
      preview={headlines[decision](programName)}
      senderName={programName}
      footer={`${programName} sent this message about your tester registration in its cross-connection control program.`}
    >
      <Text style={textStyle}>Hello {name},</Text>
      <Text style={textStyle}>{body[decision]}</Text>
      {reason ? <Text style={textStyle}>Reason given: {reason}</Text> : null}
      <Button href={signInUrl} style={buttonStyle}>
        Open Zoneward
      </Button>
    </EmailLayout>
  );
}
