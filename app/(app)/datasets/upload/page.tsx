import type { Metadata } from "next";
import { requirePageActor } from "@/server/authz";
import { inlineMaxBytes, uploadMaxBytes } from "@/server/datasets/upload-request";
import { UploadForm } from "@/ui/datasets/upload-form";
import { PageHeading, Section } from "@/ui/section";
import { Breadcrumb } from "@/ui/breadcrumb";

export const metadata: Metadata = { title: "Upload a spend history" };

export default async function UploadSpendHistoryPage() {
  await requirePageActor("dataset:upload");
  return (
    <div className="flex flex-col gap-2">
      <Breadcrumb trail={[{ href: "/datasets", label: "Spend histories" }]} />
      <PageHeading title="Upload a spend history">
        Step 1 of 2: the file. It is checked row by row; nothing is stored unless every row can be read. Step 2: what each column is.
      </PageHeading>
      <Section title="The file">
        <UploadForm inlineLimitBytes={inlineMaxBytes()} maxBytes={uploadMaxBytes()} />
      </Section>
    </div>
  );
}
