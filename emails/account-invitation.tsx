import { Button, Text } from "@react-email/components";
import { buttonStyle, EmailLayout, smallStyle, textStyle } from "./components/email-layout";

export interface AccountInvitationEmailProps {
  name: string;
  programName: string;
  inviteUrl: string;
  expiresInDays: number;
  /** What the account is for, in one sentence. */
  purpose: string;
}

export function subjectOfAccountInvitation(props: Pick<AccountInvitationEmailProps, "programName">): string {
  return `Your ${props.programName} account is ready to set up`;
}

export default function AccountInvitationEmail({ name, programName, inviteUrl, expiresInDays, purpose }: AccountInvitationEmailProps) {
  return (
    <EmailLayout
      preview={`Set up your ${programName} account`}
      senderName={programName}
      footer={`${programName} sent this message because an account was created for you in its cross-connection control program. It is a service message about your water service, not marketing.`}
    >
      <Text style={textStyle}>Hello {name},</Text>
      <Text style={textStyle}>{purpose}</Text>
      <Text style={textStyle}>Choose a password to finish setting up your account. The link works once and expires in {expiresInDays} days.</Text>
      <Button href={inviteUrl} style={buttonStyle}>
        Set up my account
      </Button>
      <Text style={smallStyle}>Or paste this address into your browser: {inviteUrl}</Text>
    </EmailLayout>
  );
}
