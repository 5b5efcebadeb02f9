import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { z } from "zod";
import { requirePageActor } from "@/server/authz";
import { isFrozenByFit, listFitsOfDataset } from "@/server/datasets/details";
import { getDatasetById } from "@/server/datasets/store";
import { RolePicker } from "@/ui/datasets/role-picker";
import { PageHeading, Section } from "@/ui/section";
import { Breadcrumb } from "@/ui/breadcrumb";

export const metadata: Metadata = { title: "Column roles" };

type Props = { params: Promise<{ id: string }> };

export default async function DatasetRolesPage({ params }: Props) {
  const actor = await requirePageActor("dataset:upload");
  const { id } = await params;
  if (!z.uuid().safeParse(id).success) notFound();
  const dataset = await getDatasetById({ workspaceId: actor.workspaceId, datasetId: id });
  if (!dataset) notFound();
  const frozen = isFrozenByFit(await listFitsOfDataset({ workspaceId: actor.workspaceId, datasetId: dataset.id }));

  return (
    <div className="flex flex-col gap-2">
      <Breadcrumb
        trail={[
          { href: "/datasets", label: "Spend histories" },
          { href: `/datasets/${dataset.id}`, label: dataset.name },
        ]}
      />
      <PageHeading title={dataset.status === "ready" ? "Change the column roles" : "Step 2 of 2: what each column is"}>
        {dataset.rowCount.toLocaleString(actor.locale)} rows and {dataset.columnCount} columns were read from {dataset.originalFilename}. Choose the outcome (what the spend
        should explain), the spend channels, any controls (price, promotions, weather…) and the period column. The checks that depend on these roles run when you
        save.
      </PageHeading>
      {frozen ? (
        <Section title="Frozen">
          <p className="text-sm text-slate-700">An approved fit uses this spend history, so its roles cannot change. Upload the file again to use other roles.</p>
        </Section>
      ) : (
        <Section title="Column roles">
          <RolePicker
            datasetId={dataset.id}
            columns={dataset.columns.map((c) => ({
              position: c.position,
              name: c.name,
              kind: c.kind,
              role: c.role,
              unit: c.unit,
              numericCount: c.numericCount,
              textCount: c.textCount,
              missingCount: c.missingCount,
              sample: c.sample,
            }))}
            currency={actor.currency}
            missingPolicy={dataset.missingPolicy}
            dateOrder={dataset.dateOrder}
            rowCount={dataset.rowCount}
          />
        </Section>
      )}
    </div>
  );
}
