import type { Metadata } from "next";
import { headers } from "next/headers";
import { notFound } from "next/navigation";
import { Alert } from "@/components/ui/alert";
import { Card } from "@/components/ui/card";
import { getActor } from "@/lib/auth/session";
import { canReissue, verifyCertificate, type CertificateVerification } from "@/lib/data/certificate-verification";
import { formatCertificateCode } from "@/lib/data/notices-format";
import { TooManyRequestsError } from "@/lib/errors";
import { clientAddress } from "@/lib/http/client-address";
import { CodeSearch } from "../code-search";
import { ReissueButton } from "./reissue-button";

export const metadata: Metadata = { title: "Certificate check", robots: { index: false, follow: false } };

function Facts({ v, code }: { v: CertificateVerification; code: string }) {
  const rows: [string, string | undefined][] = [
    ["Verification code", formatCertificateCode(code)],
    ["Program", v.programName],
    ["Assembly", v.assemblyKind],
    ["Serial number ends", v.serialTail],
    ["Town", v.town],
    ["Test date", v.testedOnWords],
    ["Next test due by", v.nextDueOnWords],
    ["Certificate issued", v.issuedOnWords],
  ];
  return (
    <dl className="mt-4 grid grid-cols-[10rem_1fr] gap-x-3 gap-y-1.5 text-sm">
      {rows.map(([label, value]) =>
        value ? (
          <div key={label} className="contents">
            <dt className="font-semibold text-ink-700">{label}</dt>
            <dd>{value}</dd>
          </div>
        ) : null,
      )}
    </dl>
  );
}

export default async function VerifyCodePage({ params, searchParams }: { params: Promise<{ code: string }>; searchParams: Promise<Record<string, string | undefined>> }) {
  const { code: raw } = await params;
  const { reissued } = await searchParams;
  const code = decodeURIComponent(raw).slice(0, 64);
  let result: CertificateVerification;
  try {
    result = await verifyCertificate({ code, address: clientAddress(await headers()) });
  } catch (error) {
    if (!(error instanceof TooManyRequestsError)) throw error;
    return (
      <Card>
        <h1 className="mb-3 text-2xl">Please wait a moment</h1>
        <Alert tone="warning">{error.message}</Alert>
      </Card>
    );
  }
  if (result.status === "not_found") notFound();
  const normalized = code.replace(/[\s-]+/g, "").toUpperCase();
  const actor = await getActor();
  // Re-issuing is for a lost or misused copy of a certificate that still proves compliance.
  const isStaff = result.status === "current" && (await canReissue(actor, normalized));
  return (
    <div className="space-y-6">
      {reissued ? <Alert tone="success">The certificate was re-issued with this new code. The old code now shows as replaced.</Alert> : null}
      <Card>
        {result.status === "current" ? (
          <Alert tone="success" title="Genuine and current">
            This certificate was issued by {result.programName}. The assembly passed its test on {result.testedOnWords} and is in compliance until its next test is due, by {result.nextDueOnWords}.
          </Alert>
        ) : result.status === "lapsed" ? (
          <Alert tone="warning" title="Genuine, but no longer proof of compliance">
            This certificate was issued by {result.programName}. {result.reason}
          </Alert>
        ) : (
          <Alert tone="danger" title="Replaced: not valid">
            This certificate was replaced by a newer one on {result.replacedOnWords}. It no longer proves compliance; ask the owner for the current certificate.
          </Alert>
        )}
        <Facts v={result} code={normalized} />
      </Card>
      {isStaff ? (
        <Card title="Program staff">
          <p className="mb-3 text-sm text-ink-700">If this certificate was lost or misused, re-issue it: it gets a new code, and this code then shows as replaced.</p>
          <ReissueButton code={normalized} />
        </Card>
      ) : null}
      <Card>
        <h2 className="mb-3 text-base">Check another certificate</h2>
        <CodeSearch />
      </Card>
    </div>
  );
}
