import { Button, Text } from "@react-email/components";
import { buttonStyle, EmailLayout, smallStyle, textStyle } from "./components/email-layout";

export interface PasswordResetEmailProps {
  name: string;
  resetUrl: string;
  expiresInMinutes: number;
}

export function subjectOfPasswordReset(): string {
  return "Choose a new Zoneward password";
}

export default function PasswordResetEmail({ name, resetUrl, expiresInMinutes }: PasswordResetEmailProps) {
  return (
    <EmailLayout
      preview="A link to choose a new password"
      senderName="Zoneward"
      footer="You received this because someone asked to reset the password of this Zoneward account. If it was not you, ignore this message: your password stays as it is."
    >
      <Text style={textStyle}>Hello {name},</Text>
      <Text style={textStyle}>Use the button below to choose a new password. The link works once and expires in {expiresInMinutes} minutes.</Text>
      <Button href={resetUrl} style={buttonStyle}>
        Choose a new password
      </Button>
      <Text style={smallStyle}>Or paste this address into your browser: {resetUrl}</Text>
    </EmailLayout>
  );
}
