import { Button } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";

/** A plain GET form: works without JavaScript, and the code ends up in the address like a scanned QR code. */
export function CodeSearch({ defaultValue = "" }: { defaultValue?: string }) {
  return (
    <form action="/verify" method="get" className="flex flex-col gap-2 sm:flex-row">
      <label htmlFor="code" className="sr-only">
        Verification code
      </label>
      <input id="code" name="code" defaultValue={defaultValue} placeholder="ABCD-EFGH-JKMN" autoCapitalize="characters" autoComplete="off" spellCheck={false} maxLength={40} className={`${inputClass} font-mono uppercase tracking-wider`} />
      <Button type="submit" size="lg">
        Check
      </Button>
    </form>
  );
}
