// The notice templates: the shape cache gives exactly what a direct render gives, every notice
// has a plain-text part, no images or tracking, absolute links only, and a missing variable
// stops the render with a message naming it.
import { describe, expect, test } from "vitest";
import { NoticeTemplateError, type NoticeEmailProps, type NoticeTemplateKind } from "@/emails/notice-shared";
import { createNoticeRenderer, renderNoticeDirect } from "@/lib/data/notices-render";
import { noticeProps } from "./notice-fixtures";

const kinds: NoticeTemplateKind[] = ["reminder", "overdue", "final", "repair_reminder"];

function propsFor(kind: NoticeTemplateKind, overrides: Partial<NoticeEmailProps> = {}): NoticeEmailProps {
  const base = noticeProps(overrides);
  return kind === "repair_reminder" ? { ...base, items: base.items.map((item) => ({ ...item, failedOn: "18 November 2026" })) } : base;
}

const secondItem = {
  assembly: "Air gap (AG), 2 in",
  location: "lab sink supply <east wall>",
  site: "Łukasz Ő Gardens, 12 Quarry Lane, Quillmere",
  accountNumber: "LV100999",
  checkWord: "inspection" as const,
  dueOn: "28 February 2027",
};

describe("the shape cache renders what a direct render gives", () => {
  const cases = kinds.flatMap((kind) => [
    { label: `${kind}, one assembly, signed link`, kind, props: propsFor(kind) },
    { label: `${kind}, two assemblies, plain link`, kind, props: propsFor(kind, { isSignedLink: false, linkExpiresOn: "", portalUrl: "http://127.0.0.1:3000/login?next=%2Fowner" }) },
  ]);
  cases.push({ label: "reminder, two assemblies", kind: "reminder", props: { ...propsFor("reminder"), items: [...propsFor("reminder").items, secondItem] } });
  cases.push({ label: "repair reminder, two assemblies", kind: "repair_reminder", props: { ...propsFor("repair_reminder"), items: [...propsFor("repair_reminder").items, { ...secondItem, failedOn: "2 November 2026" }] } });

  test.each(cases)("$label", async ({ kind, props }) => {
    const renderer = createNoticeRenderer();
    const direct = await renderNoticeDirect(kind, props);
    const first = await renderer.render(kind, props);
    expect(first).toEqual(direct);
    // A second notice of the same shape with other words reuses the shape and still matches.
    const other = { ...props, recipientName: "Idris Bramblecote-Marr", programName: "Tansy Ridge Public Water System", items: props.items.map((item) => ({ ...item, location: `${item.location} & annex` })) };
    const again = await renderer.render(kind, other);
    expect(again).toEqual(await renderNoticeDirect(kind, other));
    expect(renderer.shapesRendered).toBe(1);
  });

  test("a value that looks like a placeholder is printed as written", async () => {
    const props = propsFor("overdue", { recipientName: "zwslot0x zwslot99x" });
    const rendered = await createNoticeRenderer().render("overdue", props);
    expect(rendered).toEqual(await renderNoticeDirect("overdue", props));
    expect(rendered.text).toContain("Dear zwslot0x zwslot99x,");
  });
});

describe("what every notice e-mail holds", () => {
  test.each(kinds)("%s: plain text, program name and contact, legal footer, absolute links, no images", async (kind) => {
    const { subject, html, text } = await renderNoticeDirect(kind, propsFor(kind));
    expect(subject.length).toBeGreaterThan(10);
    expect(text).toContain("Dear Orla Quenby & Sons <Property>");
    expect(text).toContain("Thistlecombe Valley Water District");
    expect(text).toContain("backflow@thistlecombe-water.example");
    expect(text).toContain("(555) 014-2200");
    expect(text).toContain("not marketing");
    expect(text).toContain("http://127.0.0.1:3000/testers");
    expect(text).toContain("kitchen branch line");
    expect(html).toContain("Orla Quenby &amp; Sons &lt;Property&gt;");
    // No tracking pixels, no remote images, no unsubscribe (a compliance notice, not marketing).
    expect(html).not.toMatch(/<img/i);
    expect(html.toLowerCase()).not.toContain("unsubscribe");
    for (const [, href] of html.matchAll(/href="([^"]*)"/g)) expect(href).toMatch(/^https?:\/\//);
  });

  test("the final notice names the date after which service may be discontinued", async () => {
    const { subject, text } = await renderNoticeDirect("final", propsFor("final"));
    expect(subject).toContain("17 January 2027");
    expect(text).toMatch(/If no passing test report is on file by 17 January 2027, .* may discontinue water service/);
  });

  test("the repair reminder carries the safety caution and both dates", async () => {
    const { text } = await renderNoticeDirect("repair_reminder", propsFor("repair_reminder"));
    expect(text).toContain("Failed its test on 18 November 2026; repair and retest due by 1 January 2027");
    expect(text).toMatch(/shutting off the building's water/);
  });

  test("an air gap is inspected, not tested", async () => {
    const props = propsFor("reminder", { items: [secondItem] });
    const { subject, text } = await renderNoticeDirect("reminder", props);
    expect(subject).toContain("Backflow inspection due by 28 February 2027");
    expect(text).toContain("Yearly inspection due by 28 February 2027");
  });
});

describe("a missing variable stops the notice before it is rendered", () => {
  const renderer = createNoticeRenderer();
  test.each([
    { label: "no recipient name", kind: "reminder" as const, change: (p: NoticeEmailProps) => ({ ...p, recipientName: "  " }), field: "recipientName" },
    { label: "no reply-to", kind: "overdue" as const, change: (p: NoticeEmailProps) => ({ ...p, programReplyTo: undefined }), field: "programReplyTo" },
    { label: "a relative link", kind: "reminder" as const, change: (p: NoticeEmailProps) => ({ ...p, portalUrl: "/owner" }), field: "portalUrl" },
    { label: "no assemblies", kind: "overdue" as const, change: (p: NoticeEmailProps) => ({ ...p, items: [] }), field: "items" },
    { label: "an assembly without its due date", kind: "reminder" as const, change: (p: NoticeEmailProps) => ({ ...p, items: [{ ...p.items[0]!, dueOn: "" }] }), field: "items.0.dueOn" },
    { label: "a final notice without the discontinue date", kind: "final" as const, change: (p: NoticeEmailProps) => ({ ...p, discontinueOn: undefined }), field: "discontinueOn" },
    { label: "a repair reminder without the failed test date", kind: "repair_reminder" as const, change: (p: NoticeEmailProps) => ({ ...p, items: p.items.map(({ failedOn: _unused, ...item }) => item) }), field: "failedOn" },
    { label: "a signed link without its expiry", kind: "overdue" as const, change: (p: NoticeEmailProps) => ({ ...p, linkExpiresOn: "" }), field: "linkExpiresOn" },
  ])("$label", async ({ kind, change, field }) => {
    const props = change(propsFor(kind));
    const failure = await renderer.render(kind, props).then(
      () => null,
      (error: unknown) => error,
    );
    expect(failure).toBeInstanceOf(NoticeTemplateError);
    expect((failure as Error).message).toContain(field);
    await expect(renderNoticeDirect(kind, props)).rejects.toBeInstanceOf(NoticeTemplateError);
  });
});
