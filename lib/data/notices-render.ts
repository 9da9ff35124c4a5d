// Renders owner notices (HTML and plain text) from the react-email templates in emails/.
//
// A batch renders thousands of notices that differ only in their words, so each distinct
// shape (stage, number of assemblies, kind of link, preview line) is rendered once with
// placeholder tokens in every text slot, and each notice then fills the slots with its own
// values, escaped the way React escapes them. The result is byte-for-byte what a direct render
// gives (tests/unit/owner/notices-render.test.ts proves it), at a fraction of the cost.
import { render, toPlainText } from "@react-email/render";
import { createElement } from "react";
import { finalWording } from "@/emails/notice-final";
import { overdueWording } from "@/emails/notice-overdue";
import { reminderWording } from "@/emails/notice-reminder";
import { repairReminderWording } from "@/emails/notice-repair-reminder";
import { NoticeEmail, parseNoticeProps, type NoticeEmailProps, type NoticeTemplateKind, type NoticeWording } from "@/emails/notice-shared";

export interface RenderedNotice {
  subject: string;
  html: string;
  text: string;
}

export const noticeWordings: Record<NoticeTemplateKind, (props: NoticeEmailProps) => NoticeWording> = {
  reminder: reminderWording,
  overdue: overdueWording,
  final: finalWording,
  repair_reminder: repairReminderWording,
};

/** One space for any run of white space: a value reads the same in HTML and in plain text. */
function collapseWhitespace<T>(value: T): T {
  if (typeof value === "string") return value.replace(/\s+/g, " ").trim() as T;
  if (Array.isArray(value)) return value.map(collapseWhitespace) as T;
  if (value && typeof value === "object") return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, collapseWhitespace(v)])) as T;
  return value;
}

/** Validated, normalised props: throws NoticeTemplateError naming every missing variable. */
export function prepareNoticeProps(kind: NoticeTemplateKind, props: unknown): NoticeEmailProps {
  return parseNoticeProps(kind, collapseWhitespace(props));
}

async function renderElement(kind: NoticeTemplateKind, props: NoticeEmailProps, wording: NoticeWording): Promise<{ html: string; text: string }> {
  const html = await render(createElement(NoticeEmail, { props, wording, kind }));
  return { html, text: toPlainText(html) };
}

/** The plain way: one full render per notice. */
export async function renderNoticeDirect(kind: NoticeTemplateKind, rawProps: unknown): Promise<RenderedNotice> {
  const props = prepareNoticeProps(kind, rawProps);
  const wording = noticeWordings[kind](props);
  const { html, text } = await renderElement(kind, props, wording);
  return { subject: wording.subject, html, text };
}

const SLOT = /zwslot\d+x/g;

// React's own escaping of text and attribute values (react-dom escapeTextForBrowser).
const htmlEscapes: Record<string, string> = { "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#x27;" };
function escapeLikeReact(value: string): string {
  return value.replace(/[&<>"']/g, (c) => htmlEscapes[c]!);
}

interface Shape {
  html: string;
  text: string;
}

/** Replaces every string of the props with a token, remembering which value each stands for. */
function slotProps(props: NoticeEmailProps): { slotted: NoticeEmailProps; values: string[] } {
  const values: string[] = [];
  const walk = (value: unknown): unknown => {
    if (typeof value === "string") {
      values.push(value);
      return `zwslot${values.length - 1}x`;
    }
    if (Array.isArray(value)) return value.map(walk);
    if (value && typeof value === "object") return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, walk(v)]));
    return value;
  };
  return { slotted: walk(props) as NoticeEmailProps, values };
}

function fill(template: string, values: readonly string[], escape: (value: string) => string): string {
  return template.replace(SLOT, (token) => {
    const value = values[Number(token.slice(6, -1))];
    if (value === undefined) throw new Error(`Notice template slot ${token} has no value.`);
    return escape(value);
  });
}

/**
 * What decides a notice's markup apart from its words: the stage, the link kind, which
 * optional values are present, the number of assemblies, and the preview line (the e-mail
 * preview pads itself to a fixed length, so its length is part of the shape).
 */
function shapeKeyOf(kind: NoticeTemplateKind, props: NoticeEmailProps, preview: string): string {
  const present = (value: unknown) => (value === undefined || value === "" ? "0" : "1");
  return [kind, props.isSignedLink ? "s" : "p", present(props.discontinueOn), props.items.map((item) => present(item.failedOn)).join(""), preview].join("|");
}

export interface NoticeRenderer {
  render(kind: NoticeTemplateKind, props: unknown): Promise<RenderedNotice>;
  /** How many full renders were needed (for the benchmark's figures). */
  readonly shapesRendered: number;
}

/** A renderer that renders each shape once; keep one per batch run. */
export function createNoticeRenderer(maxShapes = 500): NoticeRenderer {
  const shapes = new Map<string, Promise<Shape>>();
  let shapesRendered = 0;
  return {
    get shapesRendered() {
      return shapesRendered;
    },
    async render(kind, rawProps) {
      const props = prepareNoticeProps(kind, rawProps);
      const wording = noticeWordings[kind](props);
      const { slotted, values } = slotProps(props);
      const key = shapeKeyOf(kind, props, wording.preview);
      let shape = shapes.get(key);
      if (!shape) {
        if (shapes.size >= maxShapes) shapes.clear();
        // The preview is the real one (its length shapes the markup); every other text is a slot.
        const slottedWording = { ...noticeWordings[kind](slotted), preview: wording.preview };
        shape = renderElement(kind, slotted, slottedWording);
        shapesRendered += 1;
        shapes.set(key, shape);
        shape.catch(() => shapes.delete(key));
      }
      const { html, text } = await shape;
      // One pass over the shape: a value that happens to look like a token is never filled again.
      return { subject: wording.subject, html: fill(html, values, escapeLikeReact), text: fill(text, values, (value) => value) };
    },
  };
}
