import { Card } from "@/components/ui/card";
import { CodeSearch } from "../code-search";

export default function CertificateNotFound() {
  return (
    <Card>
      <h1 className="mb-3 text-2xl">Not found</h1>
      <p className="mb-5 text-ink-700">No certificate has this code.</p>
      <CodeSearch />
    </Card>
  );
}
