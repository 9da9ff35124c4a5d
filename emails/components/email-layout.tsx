import { Body, Container, Head, Hr, Html, Preview, Section, Text } from "@react-email/components";
import type { ReactNode } from "react";

export interface EmailLayoutProps {
  preview: string;
  /** Who the message is from, e.g. the program's name. */
  senderName: string;
  /** The plain legal footer: why this message was sent (not marketing, so no unsubscribe). */
  footer: string;
  children: ReactNode;
}

const page = { backgroundColor: "#f4f6f5", fontFamily: "'Source Sans 3', 'Segoe UI', Arial, sans-serif", margin: 0, padding: "24px 0" };
const card = { backgroundColor: "#ffffff", border: "1px solid #d9e0dd", borderRadius: "8px", maxWidth: "560px", margin: "0 auto", padding: "28px 32px" };
const brand = { color: "#0e5a63", fontSize: "14px", fontWeight: 700, letterSpacing: "0.04em", textTransform: "uppercase" as const, margin: "0 0 16px" };
const foot = { color: "#5b6664", fontSize: "12px", lineHeight: "18px", margin: 0 };

/** The frame every Zoneward e-mail shares: no images, no tracking, readable as plain text. */
export function EmailLayout({ preview, senderName, footer, children }: EmailLayoutProps) {
  return (
    <Html lang="en">
      <Head />
      <Preview>{preview}</Preview>
      <Body style={page}>
        <Container style={card}>
          <Text style={brand}>{senderName}</Text>
          <Section>{children}</Section>
          <Hr style={{ borderColor: "#d9e0dd", margin: "24px 0 12px" }} />
          <Text style={foot}>{footer}</Text>
        </Container>
      </Body>
    </Html>
  );
}

export const textStyle = { color: "#1c2423", fontSize: "16px", lineHeight: "24px", margin: "0 0 14px" };
export const buttonStyle = {
  backgroundColor: "#0e5a63",
  borderRadius: "6px",
  color: "#ffffff",
  display: "inline-block",
  fontSize: "16px",
  fontWeight: 600,
  padding: "12px 20px",
  textDecoration: "none",
};
export const smallStyle = { color: "#5b6664", fontSize: "13px", lineHeight: "20px", margin: "0 0 10px" };
