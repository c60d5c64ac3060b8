// The jobs table's filtering, sorting and paging, done by @tanstack/table-core on the server
// from the URL's query string (so it works without JavaScript). Pure: no framework imports.
import {
	createTable,
	getCoreRowModel,
	getFilteredRowModel,
	getPaginationRowModel,
	getSortedRowModel,
	type ColumnDef,
	type ColumnFiltersState,
	type FilterFn,
	type TableState
} from '@tanstack/table-core';
import type { JobTableQuery } from '$lib/schemas/job';
import { activeStates, type JobState } from './states';

export interface JobRow {
	id: string;
	number: number;
	state: JobState;
	bay: string | null;
	concern: string;
	createdAt: Date;
	technicianId: string | null;
	technicianName: string | null;
	customerName: string | null;
	registration: string | null;
	vehicle: string | null;
	stepsTotal: number;
	stepsDone: number;
	outOfSpec: number;
}

const normal = (s: string) => s.toLowerCase().replace(/[\s-]+/g, '');

/** Job number, registration (spaces ignored) or customer name. */
const search: FilterFn<JobRow> = (row, _columnId, value: string) => {
	const q = value.trim().toLowerCase().replace(/^#/, '');
	if (!q) return true;
	const r = row.original;
	return (
		String(r.number) === q ||
		String(r.number).startsWith(q) ||
		(r.registration ? normal(r.registration).includes(normal(q)) : false) ||
		(r.customerName ? r.customerName.toLowerCase().includes(q) : false)
	);
};

const stateFilter: FilterFn<JobRow> = (row, _id, value: string) =>
	value === 'active' ? activeStates.includes(row.original.state) : row.original.state === value;

const technicianFilter: FilterFn<JobRow> = (row, _id, value: string) =>
	value === 'none' ? row.original.technicianId === null : row.original.technicianId === value;

/** `value` is [from, to] as 'YYYY-MM-DD' (either may be ''), compared on the UTC date. */
const dateFilter: FilterFn<JobRow> = (row, _id, value: [string, string]) => {
	const day = row.original.createdAt.toISOString().slice(0, 10);
	return (!value[0] || day >= value[0]) && (!value[1] || day <= value[1]);
};

const columns: ColumnDef<JobRow>[] = [
	{ id: 'number', accessorKey: 'number', filterFn: search, enableGlobalFilter: true },
	{ id: 'customer', accessorFn: (r) => r.customerName ?? '', sortUndefined: 'last' },
	{ id: 'registration', accessorFn: (r) => r.registration ?? '' },
	{ id: 'state', accessorKey: 'state', filterFn: stateFilter },
	{ id: 'technician', accessorFn: (r) => r.technicianName ?? '', filterFn: technicianFilter },
	{ id: 'bay', accessorFn: (r) => r.bay ?? '', filterFn: 'equalsString' },
	{
		id: 'created',
		accessorFn: (r) => r.createdAt.getTime(),
		filterFn: dateFilter
	}
];

export interface JobPage {
	rows: JobRow[];
	/** Rows matching the filters, over all pages. */
	total: number;
	page: number;
	pageCount: number;
}

export function jobPage(data: JobRow[], query: JobTableQuery): JobPage {
	const columnFilters: ColumnFiltersState = [];
	if (query.state) columnFilters.push({ id: 'state', value: query.state });
	if (query.technician) columnFilters.push({ id: 'technician', value: query.technician });
	if (query.bay) columnFilters.push({ id: 'bay', value: query.bay });
	if (query.from || query.to) columnFilters.push({ id: 'created', value: [query.from, query.to] });
	const state: Partial<TableState> = {
		globalFilter: query.q,
		columnFilters,
		sorting: [{ id: query.sort, desc: query.dir === 'desc' }],
		pagination: { pageIndex: query.page - 1, pageSize: query.size },
		columnPinning: { left: [], right: [] },
		columnVisibility: {},
		columnOrder: []
	};
	const table = createTable<JobRow>({
		data,
		columns,
		state,
		onStateChange: () => {},
		renderFallbackValue: null,
		globalFilterFn: search,
		getColumnCanGlobalFilter: (column) => column.id === 'number',
		getCoreRowModel: getCoreRowModel(),
		getFilteredRowModel: getFilteredRowModel(),
		getSortedRowModel: getSortedRowModel(),
		getPaginationRowModel: getPaginationRowModel()
	});
	const total = table.getFilteredRowModel().rows.length;
	const pageCount = Math.max(1, Math.ceil(total / query.size));
	if (query.page > pageCount) {
		// Past the last page (e.g. after narrowing the filter): show the last one.
		return jobPage(data, { ...query, page: pageCount });
	}
	return {
		rows: table.getRowModel().rows.map((r) => r.original),
		total,
		page: query.page,
		pageCount
	};
}
