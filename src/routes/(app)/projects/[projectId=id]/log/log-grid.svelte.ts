/**
 * The grid's column model (TanStack table-core, headless) and the user's column choice,
 * remembered in localStorage. Filtering, sorting and paging are the server's: the table
 * here only knows the rows of the current page.
 */
import {
	createTable,
	getCoreRowModel,
	type ColumnDef,
	type Table,
	type VisibilityState
} from '@tanstack/table-core';
import { COLUMNS, type WeldLogRow } from '$lib/weld-log';

const STORAGE_KEY = 'tacksheet.weld-log.columns';
/** The weld number is how a row is found on the sheet, so it cannot be hidden. */
const ALWAYS_SHOWN = 'weldNumber';

const columns: ColumnDef<WeldLogRow, string | number>[] = COLUMNS.map((column) => ({
	id: column.id,
	header: column.header,
	accessorFn: column.value,
	enableHiding: column.id !== ALWAYS_SHOWN
}));

function defaults(): VisibilityState {
	return Object.fromEntries(COLUMNS.map((column) => [column.id, column.shown]));
}

export class ColumnChoice {
	visibility = $state<VisibilityState>(defaults());

	/**
	 * Read the saved choice. Called once the page is in the browser: the server renders the
	 * defaults, and hydration must see the same columns before they change.
	 */
	restore() {
		try {
			const saved: unknown = JSON.parse(localStorage.getItem(STORAGE_KEY) ?? 'null');
			if (saved && typeof saved === 'object')
				for (const [id, shown] of Object.entries(saved))
					if (id in this.visibility && id !== ALWAYS_SHOWN && typeof shown === 'boolean')
						this.visibility[id] = shown;
		} catch {
			// A damaged entry is forgotten: the defaults are shown.
		}
	}

	set(id: string, shown: boolean) {
		if (id === ALWAYS_SHOWN) return;
		this.visibility[id] = shown;
		this.save();
	}

	reset() {
		this.visibility = defaults();
		this.save();
	}

	private save() {
		localStorage.setItem(STORAGE_KEY, JSON.stringify(this.visibility));
	}
}

export function logTable(rows: WeldLogRow[], visibility: VisibilityState): Table<WeldLogRow> {
	const table = createTable<WeldLogRow>({
		data: rows,
		columns,
		getCoreRowModel: getCoreRowModel(),
		manualFiltering: true,
		manualSorting: true,
		manualPagination: true,
		state: {},
		onStateChange: () => {},
		renderFallbackValue: ''
	});
	table.setOptions((previous) => ({
		...previous,
		state: { ...table.initialState, columnVisibility: { ...visibility } }
	}));
	return table;
}
