"use client";

import { useRouter } from "next/navigation";
import { useState, type ReactNode } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { sendJson } from "./send-json";

export type FieldErrors = Record<string, string[]>;

interface JsonFormProps<T> {
  method: "POST" | "PUT" | "PATCH";
  url: string;
  /** FormData → the route's JSON body. */
  toBody: (data: FormData) => unknown;
  submitLabel: string;
  submitVariant?: "primary" | "danger" | "secondary";
  /** Shown after a save; the page is refreshed from the server either way. */
  successMessage?: string | ((data: T) => string);
  onSuccess?: (data: T) => void;
  children: (errors: FieldErrors) => ReactNode;
  extraActions?: ReactNode;
  className?: string;
}

/**
 * A form whose fields travel as JSON to one of the staff route handlers. The server's field
 * errors come back by name and are shown beside each field; nothing is saved on an error.
 */
export function JsonForm<T = unknown>({ method, url, toBody, submitLabel, submitVariant = "primary", successMessage, onSuccess, children, extraActions, className = "space-y-4" }: JsonFormProps<T>) {
  const router = useRouter();
  const [errors, setErrors] = useState<FieldErrors>({});
  const [message, setMessage] = useState<{ tone: "success" | "danger"; text: string } | null>(null);
  const [isBusy, setIsBusy] = useState(false);
  return (
    <form
      noValidate
      className={className}
      onSubmit={(event) => {
        event.preventDefault();
        const form = event.currentTarget;
        setIsBusy(true);
        setMessage(null);
        void sendJson<T>(method, url, toBody(new FormData(form))).then((result) => {
          setIsBusy(false);
          if (!result.ok) {
            setErrors(result.fieldErrors);
            setMessage({ tone: "danger", text: result.error });
            return;
          }
          setErrors({});
          const text = typeof successMessage === "function" ? successMessage(result.data) : successMessage;
          if (text) setMessage({ tone: "success", text });
          onSuccess?.(result.data);
          router.refresh();
        });
      }}
    >
      {children(errors)}
      {message ? <Alert tone={message.tone} live>{message.text}</Alert> : null}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" variant={submitVariant} disabled={isBusy}>
          {isBusy ? "Saving…" : submitLabel}
        </Button>
        {extraActions}
      </div>
    </form>
  );
}

/** Reads a text field (trimmed by the server). */
export const textOf = (data: FormData, name: string) => {
  const value = data.get(name);
  return typeof value === "string" ? value : "";
};
/** Reads a checkbox. */
export const checkedOf = (data: FormData, name: string) => data.get(name) === "on";
