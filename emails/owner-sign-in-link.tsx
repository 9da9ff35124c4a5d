import { Button, Text } from "@react-email/components";
import { buttonStyle, EmailLayout, smallStyle, textStyle } from "./components/email-layout";

export interface OwnerSignInLinkEmailProps {
  name: string;
  signInUrl: string;
  /** Written out, e.g. "1 January 2027". */
  expiresOn: string;
  programNames: string[];
}

export function subjectOfOwnerSignInLink(): string {
  return "Your link to see your backflow assemblies";
}

/** The link an owner asked for on the owner sign-in page. */
export default function OwnerSignInLinkEmail({ name, signInUrl, expiresOn, programNames }: OwnerSignInLinkEmailProps) {
  const programs = programNames.join(" and ");
  return (
    <EmailLayout
      preview="A link to sign in to your property's page"
      senderName={programs || "Zoneward"}
      footer={`You received this because someone asked for a sign-in link for this address on the owner sign-in page of ${programs || "the water program"}. If it was not you, ignore this message: nothing changes.`}
    >
      <Text style={textStyle}>Dear {name},</Text>
      <Text style={textStyle}>Use the button below to see each backflow assembly at your properties, its due date and its test history, and to download compliance certificates. The link works once and until {expiresOn}.</Text>
      <Button href={signInUrl} style={buttonStyle}>
        See your assemblies
      </Button>
      <Text style={smallStyle}>Or open this address: {signInUrl}</Text>
    </EmailLayout>
  );
}
