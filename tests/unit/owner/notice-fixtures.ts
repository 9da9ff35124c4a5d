// Notice props for the template tests: every value present, with characters that need escaping.
import type { NoticeEmailProps } from "@/emails/notice-shared";

export function noticeProps(overrides: Partial<NoticeEmailProps> = {}): NoticeEmailProps {
  return {
    programName: "Thistlecombe Valley Water District",
    programPhone: "(555) 014-2200",
    programReplyTo: "backflow@thistlecombe-water.example",
    programAddress: "Cross-Connection Control, 40 Reservoir Row, Quillmere",
    recipientName: "Orla Quenby & Sons <Property> \"Care\" 'Ltd'",
    noticeDate: "2 December 2026",
    items: [
      {
        assembly: "Reduced pressure principle assembly (RP), Tallowmere TR-4, 1 in, serial TA123456",
        location: "kitchen branch line",
        site: "Hearthside Restaurant, 477 Mossgate Avenue, Quillmere",
        accountNumber: "LV100154",
        checkWord: "test",
        dueOn: "1 January 2027",
      },
    ],
    portalUrl: "http://127.0.0.1:3000/o/abcDEF123_-xyz?from=notice&x=1",
    isSignedLink: true,
    linkExpiresOn: "1 January 2027",
    testersUrl: "http://127.0.0.1:3000/testers",
    discontinueOn: "17 January 2027",
    ...overrides,
  };
}
