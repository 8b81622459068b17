"use client";

import { keepPreviousData, useQuery, useQueryClient } from "@tanstack/react-query";
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  useReactTable,
  type PaginationState,
  type RowSelectionState,
  type SortingState,
  type Updater,
} from "@tanstack/react-table";
import Link from "next/link";
import { useEffect, useId, useMemo, useState, useTransition } from "react";
import { AlertTriangle, ArrowDown, ArrowUp, ArrowUpDown, ChevronLeft, ChevronRight, Eye, Search } from "lucide";
import { declineSelectedAction, startReviewAction } from "@/app/lab/proposals/actions";
import { ProposalStateBadge } from "@/components/proposal-state-badge";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import type { TriagePage, TriageRow } from "@/db/queries/triage";
import { cn } from "@/lib/cn";
import { formatDate } from "@/lib/format";
import { printerTypeLabels, printerTypeValues, proposalKindLabels, proposalKindValues } from "@/lib/validation/proposal";
import {
  triageQueryToSearchParams,
  triageStateLabels,
  triageStateValues,
  type TriageQuery,
  type TriageSort,
  type TriageState,
} from "@/lib/validation/triage";
import { labFetch } from "./api";

const SEARCH_DEBOUNCE_MS = 300;
const PAGE_SIZES = [10, 25, 50, 100] as const;
const ALL_STATES = "all";

type Props = {
  initialQuery: TriageQuery;
  initialPage: TriagePage;
  timeZone: string;
  /** The server's clock when the page was rendered: ages are counted from it, the same on both sides. */
  renderedAt: number;
};

const DAY = 24 * 60 * 60 * 1000;
function ageText(createdAt: number, now: number): string {
  const ms = Math.max(0, now - createdAt);
  if (ms < 2 * 60 * 60 * 1000) return `${Math.max(1, Math.round(ms / 60_000))} min`;
  if (ms < 2 * DAY) return `${Math.round(ms / (60 * 60 * 1000))} h`;
  return `${Math.floor(ms / DAY)} days`;
}

const column = createColumnHelper<TriageRow>();
const selectClass = "rounded-lg border border-line bg-surface px-3 py-2 text-sm";

export function TriageTable({ initialQuery, initialPage, timeZone, renderedAt }: Props) {
  const uid = useId();
  const queryClient = useQueryClient();
  const [query, setQuery] = useState<TriageQuery>(initialQuery);
  const [searchText, setSearchText] = useState(initialQuery.q ?? "");
  const [rowSelection, setRowSelection] = useState<RowSelectionState>({});
  const [declineOpen, setDeclineOpen] = useState(false);
  const [reason, setReason] = useState("");
  const [reasonError, setReasonError] = useState<string | undefined>();
  const [notice, setNotice] = useState<{ tone: "ok" | "error"; text: string } | null>(null);
  const [pending, startTransition] = useTransition();

  const params = triageQueryToSearchParams(query).toString();
  const [initialParams] = useState(() => triageQueryToSearchParams(initialQuery).toString());

  const result = useQuery({
    queryKey: ["lab-triage", params],
    queryFn: ({ signal }) => labFetch<TriagePage>(`/api/lab/proposals?${params}`, { signal }),
    placeholderData: keepPreviousData,
    initialData: params === initialParams ? initialPage : undefined,
    initialDataUpdatedAt: renderedAt,
  });
  const data = result.data ?? initialPage;

  // The search box waits for a pause in typing; any new search starts again at page 1.
  useEffect(() => {
    const timer = setTimeout(() => {
      setQuery((previous) => (previous.q ?? "") === searchText.trim() ? previous : { ...previous, q: searchText.trim() || undefined, page: 1 });
    }, SEARCH_DEBOUNCE_MS);
    return () => clearTimeout(timer);
  }, [searchText]);

  // The address bar follows the filters, so reload, back and a shared link show the same view.
  useEffect(() => {
    const url = params ? `${window.location.pathname}?${params}` : window.location.pathname;
    window.history.replaceState(window.history.state, "", url);
  }, [params]);

  // A selection belongs to the rows on screen: a new page or filter starts without one.
  const selectionScope = `${params}`;
  const [selectionFor, setSelectionFor] = useState(selectionScope);
  if (selectionFor !== selectionScope) {
    setSelectionFor(selectionScope);
    setRowSelection({});
  }

  function update(patch: Partial<TriageQuery>) {
    setNotice(null);
    setQuery((previous) => ({ ...previous, page: 1, ...patch }));
  }

  const sorting: SortingState = [{ id: query.sort, desc: query.dir === "desc" }];
  const pagination: PaginationState = { pageIndex: data.page - 1, pageSize: data.pageSize };

  const columns = useMemo(
    () => [
      column.display({
        id: "select",
        header: ({ table }) => (
          <input
            type="checkbox"
            aria-label="Select all waiting proposals on this page"
            className="h-4 w-4 accent-teal"
            checked={table.getIsAllRowsSelected()}
            ref={(element) => {
              if (element) element.indeterminate = table.getIsSomeRowsSelected();
            }}
            disabled={!table.getRowModel().rows.some((row) => row.getCanSelect())}
            onChange={table.getToggleAllRowsSelectedHandler()}
          />
        ),
        cell: ({ row }) => (
          <input
            type="checkbox"
            aria-label={`Select “${row.original.title}”`}
            className="h-4 w-4 accent-teal"
            checked={row.getIsSelected()}
            disabled={!row.getCanSelect()}
            onChange={row.getToggleSelectedHandler()}
          />
        ),
      }),
      column.accessor("title", {
        header: "Title",
        enableSorting: false,
        cell: ({ row }) => (
          <div className="flex flex-col gap-0.5">
            <Link href={`/lab/proposals/${row.original.id}`} prefetch={false} className="font-medium text-ink hover:text-teal hover:underline">
              {row.original.title}
            </Link>
            {row.original.needsSafetyNote ? (
              <span className="inline-flex items-center gap-1 text-xs text-ember">
                <Icon node={AlertTriangle} className="h-3 w-3" /> Needs a safety note
              </span>
            ) : null}
          </div>
        ),
      }),
      column.accessor("kind", { header: "Kind", enableSorting: false, cell: (info) => proposalKindLabels[info.getValue()] }),
      column.accessor("printerType", { header: "Printer type", enableSorting: false, cell: (info) => printerTypeLabels[info.getValue()] }),
      column.accessor("state", {
        header: "State",
        enableSorting: false,
        cell: ({ row }) => (
          <div className="flex flex-wrap items-center gap-1.5">
            <ProposalStateBadge state={row.original.state} />
            {row.original.state === "submitted" && row.original.reviewStartedAt ? (
              <span className="inline-flex items-center gap-1 text-xs text-muted" title="A host started reviewing it; the proposer can no longer edit it.">
                <Icon node={Eye} className="h-3 w-3" /> in review
              </span>
            ) : null}
          </div>
        ),
      }),
      column.accessor("voteCount", { id: "votes", header: "Votes", sortDescFirst: true, cell: (info) => <span className="font-mono">{info.getValue()}</span> }),
      column.accessor("createdAt", {
        id: "age",
        header: "Age",
        sortDescFirst: true,
        cell: ({ row }) => (
          <div className="flex flex-col">
            <span>{ageText(row.original.createdAt, renderedAt)}</span>
            <span className="text-xs text-muted">{formatDate(new Date(row.original.submittedAt ?? row.original.createdAt), timeZone)}</span>
          </div>
        ),
      }),
      column.accessor("proposerName", { header: "Proposed by", enableSorting: false, cell: (info) => info.getValue() ?? "—" }),
    ],
    [renderedAt, timeZone],
  );

  // TanStack Table hands out fresh functions each render, so the compiler rightly leaves this component alone.
  // eslint-disable-next-line react-hooks/incompatible-library
  const table = useReactTable({
    data: data.rows,
    columns,
    getRowId: (row) => row.id,
    getCoreRowModel: getCoreRowModel(),
    manualSorting: true,
    manualPagination: true,
    manualFiltering: true,
    enableMultiSort: false,
    enableSortingRemoval: false,
    rowCount: data.total,
    enableRowSelection: (row) => row.original.state === "submitted",
    state: { sorting, pagination, rowSelection },
    onRowSelectionChange: setRowSelection,
    onSortingChange: (updater: Updater<SortingState>) => {
      const next = typeof updater === "function" ? updater(sorting) : updater;
      const first = next[0];
      if (first) update({ sort: first.id as TriageSort, dir: first.desc ? "desc" : "asc" });
    },
    onPaginationChange: (updater: Updater<PaginationState>) => {
      const next = typeof updater === "function" ? updater(pagination) : updater;
      setNotice(null);
      setQuery((previous) => ({ ...previous, page: next.pageSize !== previous.pageSize ? 1 : next.pageIndex + 1, pageSize: next.pageSize }));
    },
  });

  const selectedIds = Object.keys(rowSelection).filter((id) => rowSelection[id]);
  const stateValue: string = query.state.length === triageStateValues.length ? ALL_STATES : query.state.join(",");
  const firstShown = data.total === 0 ? 0 : (data.page - 1) * data.pageSize + 1;
  const lastShown = Math.min(data.total, data.page * data.pageSize);
  const pageCount = Math.max(1, Math.ceil(data.total / data.pageSize));

  function afterBulk(text: string, tone: "ok" | "error" = "ok") {
    setNotice({ tone, text });
    setRowSelection({});
    void queryClient.invalidateQueries({ queryKey: ["lab-triage"] });
  }

  function startReview() {
    startTransition(async () => {
      const outcome = await startReviewAction({ ids: selectedIds });
      if (!outcome.ok) return setNotice({ tone: "error", text: outcome.message });
      const { started, skipped } = outcome.data;
      afterBulk(`Review started on ${started} proposal${started === 1 ? "" : "s"}${skipped ? ` (${skipped} already in review)` : ""}. Their proposers can no longer edit them.`);
    });
  }

  function declineSelected() {
    const trimmed = reason.trim();
    if (trimmed.length < 10) {
      setReasonError("Give the proposers a reason of at least 10 characters.");
      return;
    }
    startTransition(async () => {
      const outcome = await declineSelectedAction({ ids: selectedIds, reason: trimmed });
      if (!outcome.ok) {
        setReasonError(outcome.fields?.reason ?? outcome.message);
        return;
      }
      const { declined, skipped } = outcome.data;
      setDeclineOpen(false);
      setReason("");
      setReasonError(undefined);
      afterBulk(
        `Declined ${declined} proposal${declined === 1 ? "" : "s"}; each proposer is e-mailed the reason.${skipped.length ? ` Skipped ${skipped.length}: ${skipped[0]?.message}` : ""}`,
        skipped.length && declined === 0 ? "error" : "ok",
      );
    });
  }

  return (
    <div className="flex flex-col gap-4">
      <form role="search" aria-label="Filter proposals" className="flex flex-wrap items-end gap-3" onSubmit={(event) => event.preventDefault()}>
        <div className="flex min-w-[14rem] flex-1 flex-col gap-1">
          <label htmlFor={`${uid}-q`} className="text-sm font-medium">Search</label>
          <div className="relative">
            <Icon node={Search} className="pointer-events-none absolute left-3 top-1/2 -translate-y-1/2 text-muted" />
            <input
              id={`${uid}-q`}
              type="search"
              value={searchText}
              onChange={(event) => setSearchText(event.target.value)}
              placeholder="Title, why or description"
              className="w-full rounded-lg border border-line bg-surface py-2 pl-9 pr-3 text-sm"
            />
          </div>
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor={`${uid}-state`} className="text-sm font-medium">State</label>
          <select
            id={`${uid}-state`}
            className={selectClass}
            value={stateValue}
            onChange={(event) => {
              const value = event.target.value;
              update({ state: value === ALL_STATES ? [...triageStateValues] : (value.split(",") as TriageState[]) });
            }}
          >
            {triageStateValues.map((state) => (
              <option key={state} value={state}>{triageStateLabels[state]}</option>
            ))}
            {stateValue.includes(",") ? <option value={stateValue}>{query.state.map((state) => triageStateLabels[state]).join(" + ")}</option> : null}
            <option value={ALL_STATES}>All but drafts</option>
          </select>
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor={`${uid}-kind`} className="text-sm font-medium">Kind</label>
          <select
            id={`${uid}-kind`}
            className={selectClass}
            value={query.kind ?? ""}
            onChange={(event) => update({ kind: (event.target.value || undefined) as TriageQuery["kind"] })}
          >
            <option value="">All kinds</option>
            {proposalKindValues.map((kind) => (
              <option key={kind} value={kind}>{proposalKindLabels[kind]}</option>
            ))}
          </select>
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor={`${uid}-printer`} className="text-sm font-medium">Printer type</label>
          <select
            id={`${uid}-printer`}
            className={selectClass}
            value={query.printerType ?? ""}
            onChange={(event) => update({ printerType: (event.target.value || undefined) as TriageQuery["printerType"] })}
          >
            <option value="">All printer types</option>
            {printerTypeValues.map((type) => (
              <option key={type} value={type}>{printerTypeLabels[type]}</option>
            ))}
          </select>
        </div>
      </form>

      {selectedIds.length > 0 ? (
        <Card className="flex flex-col gap-3 border-teal/40 bg-teal-soft/40 p-4" aria-label="Bulk actions">
          <div className="flex flex-wrap items-center gap-3">
            <p className="text-sm font-semibold">{selectedIds.length} selected</p>
            <Button size="sm" variant="secondary" disabled={pending} onClick={startReview}>Start review</Button>
            <Button size="sm" variant="secondary" disabled={pending} onClick={() => setDeclineOpen((open) => !open)} aria-expanded={declineOpen}>
              Decline selected…
            </Button>
            <Button size="sm" variant="quiet" disabled={pending} onClick={() => setRowSelection({})}>Clear selection</Button>
          </div>
          {declineOpen ? (
            <div className="flex flex-col gap-2">
              <label htmlFor={`${uid}-reason`} className="text-sm font-medium">Reason for all {selectedIds.length} (clear duplicates, spam)</label>
              <textarea
                id={`${uid}-reason`}
                value={reason}
                onChange={(event) => {
                  setReason(event.target.value);
                  setReasonError(undefined);
                }}
                rows={3}
                aria-invalid={reasonError ? true : undefined}
                aria-describedby={`${uid}-reason-hint${reasonError ? ` ${uid}-reason-error` : ""}`}
                className="w-full rounded-lg border border-line bg-surface px-3 py-2 text-sm aria-invalid:border-rose"
              />
              <p id={`${uid}-reason-hint`} className="text-xs text-muted">Each proposer is e-mailed this reason.</p>
              {reasonError ? <p id={`${uid}-reason-error`} className="text-xs font-medium text-rose">{reasonError}</p> : null}
              <div>
                <Button size="sm" variant="danger" disabled={pending} onClick={declineSelected}>
                  Decline {selectedIds.length} proposal{selectedIds.length === 1 ? "" : "s"}
                </Button>
              </div>
            </div>
          ) : null}
        </Card>
      ) : null}

      <p role="status" aria-live="polite" className={cn("text-sm", notice?.tone === "error" ? "font-medium text-rose" : "text-moss", !notice && "sr-only")}>
        {notice?.text ?? ""}
      </p>

      <Card className={cn("overflow-x-auto p-0 transition-opacity", result.isFetching && result.isPlaceholderData && "opacity-60")} aria-busy={result.isFetching}>
        <table className="w-full min-w-[48rem] text-sm">
          <caption className="sr-only">Proposals for triage; sortable by votes and age</caption>
          <thead className="border-b border-line bg-paper text-left text-muted">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  const sortable = header.column.getCanSort();
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      aria-sort={sortable ? (sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : "none") : undefined}
                      className={cn("px-4 py-2.5 font-medium", header.column.id === "select" && "w-10 pr-0", header.column.id === "votes" && "text-right")}
                    >
                      {sortable ? (
                        <button
                          type="button"
                          onClick={header.column.getToggleSortingHandler()}
                          className={cn("inline-flex items-center gap-1 rounded hover:text-teal", sorted && "text-ink")}
                        >
                          {flexRender(header.column.columnDef.header, header.getContext())}
                          <Icon node={sorted === "asc" ? ArrowUp : sorted === "desc" ? ArrowDown : ArrowUpDown} className="h-3.5 w-3.5" />
                          <span className="sr-only">{header.column.id === "age" ? (sorted === "desc" ? "(oldest first)" : sorted === "asc" ? "(newest first)" : "") : sorted === "desc" ? "(most first)" : sorted === "asc" ? "(fewest first)" : ""}</span>
                        </button>
                      ) : (
                        flexRender(header.column.columnDef.header, header.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.length === 0 ? (
              <tr>
                <td colSpan={columns.length} className="px-4 py-8 text-center text-muted">
                  {result.isError ? `Could not load proposals: ${result.error.message}` : "No proposals match these filters."}
                </td>
              </tr>
            ) : (
              table.getRowModel().rows.map((row) => (
                <tr key={row.id} className={cn("border-b border-line last:border-0 hover:bg-paper", row.getIsSelected() && "bg-teal-soft/40")}>
                  {row.getVisibleCells().map((cell) => (
                    <td key={cell.id} className={cn("px-4 py-2.5 align-top", cell.column.id === "select" && "w-10 pr-0", cell.column.id === "votes" && "text-right")}>
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </td>
                  ))}
                </tr>
              ))
            )}
          </tbody>
        </table>
      </Card>
      {result.isError && data.rows.length > 0 ? <p className="text-sm text-rose">Could not refresh: {result.error.message}</p> : null}

      <nav aria-label="Pages" className="flex flex-wrap items-center justify-between gap-3 text-sm">
        <p className="text-muted" data-testid="triage-total">
          {data.total === 0 ? "No proposals" : `Showing ${firstShown}–${lastShown} of ${data.total}`}
        </p>
        <div className="flex flex-wrap items-center gap-3 whitespace-nowrap">
          <label htmlFor={`${uid}-size`} className="text-muted">Per page</label>
          <select id={`${uid}-size`} className={cn(selectClass, "py-1.5")} value={data.pageSize} onChange={(event) => table.setPageSize(Number(event.target.value))}>
            {PAGE_SIZES.map((size) => (
              <option key={size} value={size}>{size}</option>
            ))}
          </select>
          <Button size="sm" variant="secondary" onClick={() => table.previousPage()} disabled={!table.getCanPreviousPage()}>
            <Icon node={ChevronLeft} className="h-3.5 w-3.5" /> Previous
          </Button>
          <span>
            Page {data.page} of {pageCount}
          </span>
          <Button size="sm" variant="secondary" onClick={() => table.nextPage()} disabled={!table.getCanNextPage()}>
            Next <Icon node={ChevronRight} className="h-3.5 w-3.5" />
          </Button>
        </div>
      </nav>
    </div>
  );
}
