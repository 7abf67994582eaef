import { useState } from "react";
import { createColumnHelper } from "@tanstack/react-table";
import { PageHeader, Card, ErrorNote } from "../../../components/ui/layout";
import { DataTable, pagedProps } from "../../../components/ui/data-table";
import { TextField, SelectField } from "../../../components/ui/field";
import { Button } from "../../../components/ui/button";
import { errorMessage } from "../../../lib/api-client";
import { useListParams } from "../../../lib/use-list-params";
import type { Shipment } from "../../../../shared/shipments/shipments.schemas";
import { useLabs, useReceiveShipment, useShipments, useShipTools } from "../api/shipments";
import { TagListPicker } from "./tag-list-picker";
import { shortWhen } from "./format";
import { RoleNotice } from "../../../components/ui/role-notice";
import { useCan, useRoleName } from "../../auth/api/auth";

const col = createColumnHelper<Shipment>();

/** Ship several tools to an outside lab at once; receive each back (then record its calibration from the certificate). */
export function ShipmentsPage() {
  const list = useListParams(["q"] as const);
  const shipments = useShipments({ open: "true", q: list.filters.q || undefined, page: list.page, pageSize: list.pageSize });
  const labs = useLabs();
  const ship = useShipTools();
  const receive = useReceiveShipment();
  const [tags, setTags] = useState<string[]>([]);
  const [labId, setLabId] = useState("");
  const [purchaseOrder, setPurchaseOrder] = useState("");
  const [expectedBackAt, setExpectedBackAt] = useState("");
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const canShip = useCan("shipments.write");
  const roleName = useRoleName();

  const columns = [
    col.accessor((s) => s.tool.assetTag, { id: "tool", header: "Tool", cell: (c) => <span className="font-mono font-semibold">{c.getValue()}</span> }),
    col.accessor((s) => s.tool.description, { id: "description", header: "Description" }),
    col.accessor((s) => s.lab.name, { id: "lab", header: "Lab" }),
    col.accessor("shippedAt", { header: "Shipped", cell: (c) => shortWhen(c.getValue()) }),
    col.accessor("purchaseOrder", { header: "PO" }),
    col.accessor("expectedBackAt", { header: "Expected back", cell: (c) => (c.row.original.lateBack ? <strong className="text-stop">✕ {c.getValue()} (late)</strong> : (c.getValue() ?? "—")) }),
    ...(!canShip ? [] : [col.display({
      id: "receive",
      header: "",
      cell: (c) => (
        <Button
          variant="secondary"
          disabled={receive.isPending}
          onClick={() =>
            receive.mutate(c.row.original.id, {
              onSuccess: (s) => setMessage({ ok: true, text: `${s.tool.assetTag} received back from ${s.lab.name}. Record its calibration from the certificate (with the review) before it returns to service.` }),
              onError: (e) => setMessage({ ok: false, text: errorMessage(e) }),
            })
          }
        >
          Receive {c.row.original.tool.assetTag}
        </Button>
      ),
    })]),
  ];

  return (
    <div>
      <PageHeader title="Outside lab shipments" subtitle="Tools away for calibration are not available until they come back and their certificate is reviewed." />
      {!canShip && <RoleNotice roleName={roleName}>can read the tools away at outside labs but not ship or receive them; the crib does.</RoleNotice>}
      {canShip && (
      <Card title="Ship tools to a lab" className="mb-5">
        <div className="grid gap-3 md:grid-cols-2">
          <div>
            <TagListPicker tags={tags} setTags={setTags} listLabel="Tools to ship" autoFocus={false} />
          </div>
          <div className="grid gap-3">
            <SelectField label="Lab" value={labId} onChange={(e) => setLabId(e.target.value)}>
              <option value="">Choose the lab</option>
              {labs.data?.items.map((l) => (
                <option key={l.id} value={l.id}>
                  {l.name}
                  {l.accreditationExpiresAt ? ` (accreditation to ${l.accreditationExpiresAt})` : ""}
                </option>
              ))}
            </SelectField>
            <TextField label="Purchase order" value={purchaseOrder} onChange={(e) => setPurchaseOrder(e.target.value)} />
            <TextField label="Expected back" type="date" value={expectedBackAt} onChange={(e) => setExpectedBackAt(e.target.value)} />
          </div>
        </div>
        <Button
          className="mt-4"
          disabled={!tags.length || !labId || ship.isPending}
          onClick={() =>
            ship.mutate(
              { assetTags: tags, labId, purchaseOrder: purchaseOrder || undefined, expectedBackAt: expectedBackAt || undefined },
              {
                onSuccess: (r) => {
                  setMessage({ ok: true, text: `Shipped ${r.items.map((s) => s.tool.assetTag).join(", ")} to ${r.items[0]?.lab.name}.` });
                  setTags([]);
                  setPurchaseOrder("");
                },
                onError: (e) => setMessage({ ok: false, text: errorMessage(e) }),
              },
            )
          }
        >
          Ship {tags.length || ""} tool{tags.length === 1 ? "" : "s"}
        </Button>
      </Card>
      )}
      {message && (message.ok ? <p role="status" className="mb-3 rounded-md bg-go-light px-3 py-2 font-semibold text-go">{message.text}</p> : <ErrorNote>{message.text}</ErrorNote>)}
      <DataTable
        label="Tools away at outside labs"
        columns={columns}
        {...pagedProps(shipments, list, list.pageSize)}
        rowKey={(r) => r.id}
        empty={<p className="text-center text-ink-faint">No tools are away.</p>}
        toolbar={<TextField label="Search" placeholder="Tag, lab, PO" value={list.filters.q} onChange={(e) => list.setFilter("q", e.target.value)} />}
      />
    </div>
  );
}
