"use client";

/**
 * Two large buttons for a yes/no reading (gloved fingers on a phone: at least 48 px tall).
 * The passing answer is on the left; the chosen answer is filled.
 */
export function YesNo({
  id,
  label,
  value,
  onChange,
  yes = "Yes",
  no = "No",
  isInvalid = false,
  describedBy,
}: {
  id: string;
  label: string;
  value: boolean | undefined | null;
  onChange: (value: boolean) => void;
  yes?: string;
  no?: string;
  isInvalid?: boolean;
  describedBy?: string;
}) {
  const base = "min-h-12 flex-1 rounded-md border-2 px-3 py-2 text-base font-semibold transition-colors focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-estuary-600";
  const option = (answer: boolean, text: string) => {
    const isChosen = value === answer;
    const chosen = answer ? "border-pass-600 bg-pass-50 text-pass-700" : "border-fail-600 bg-fail-50 text-fail-700";
    return (
      <button
        type="button"
        role="radio"
        aria-checked={isChosen}
        data-answer={answer ? "yes" : "no"}
        onClick={() => onChange(answer)}
        className={`${base} ${isChosen ? chosen : `bg-white text-ink-800 ${isInvalid ? "border-fail-600" : "border-ink-200"} hover:bg-ink-50`}`}
      >
        {isChosen ? <span aria-hidden="true">{answer ? "✓ " : "✗ "}</span> : null}
        {text}
      </button>
    );
  };
  return (
    <div id={id} role="radiogroup" aria-label={label} aria-describedby={describedBy} aria-invalid={isInvalid || undefined} className="flex gap-2">
      {option(true, yes)}
      {option(false, no)}
    </div>
  );
}
