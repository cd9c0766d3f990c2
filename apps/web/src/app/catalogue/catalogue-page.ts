import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  signal,
  type Signal,
  viewChild,
} from '@angular/core';
import { takeUntilDestroyed, toObservable, toSignal } from '@angular/core/rxjs-interop';
import { MatButton } from '@angular/material/button';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { MatDialog } from '@angular/material/dialog';
import { MatFormField, MatLabel, MatPrefix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatOption, MatSelect } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatSort, MatSortHeader } from '@angular/material/sort';
import {
  MatCell,
  MatCellDef,
  MatColumnDef,
  MatHeaderCell,
  MatHeaderCellDef,
  MatHeaderRow,
  MatHeaderRowDef,
  MatNoDataRow,
  MatRow,
  MatRowDef,
  MatTable,
  MatTableDataSource,
} from '@angular/material/table';
import { RouterLink } from '@angular/router';
import type { FilmProcess, Stock } from '@clearbase/contracts';
import { catchError, debounceTime, distinctUntilChanged, map, of, startWith, Subject, switchMap } from 'rxjs';
import { Session } from '../auth/session';
import { readProblem } from '../problem/read-problem';
import { CatalogueApi, type StockFilters } from './catalogue-api';
import { NewStockDialog } from './new-stock-dialog';
import { maskingLabel, processChoices, processLabel } from './stock-labels';

interface CatalogueView {
  loading: boolean;
  stocks: Stock[];
  problem: string | null;
}

// Typing in the search waits this long before asking the server (a common UI pause, our choice).
const searchPauseMs = 300;

/** Every signed-in user: the stock catalogue, searched and filtered by the server, sorted in the table. */
@Component({
  selector: 'cb-catalogue-page',
  imports: [
    RouterLink,
    MatTable,
    MatColumnDef,
    MatHeaderCell,
    MatHeaderCellDef,
    MatCell,
    MatCellDef,
    MatHeaderRow,
    MatHeaderRowDef,
    MatRow,
    MatRowDef,
    MatNoDataRow,
    MatSort,
    MatSortHeader,
    MatFormField,
    MatLabel,
    MatPrefix,
    MatInput,
    MatSelect,
    MatOption,
    MatButtonToggleGroup,
    MatButtonToggle,
    MatButton,
    MatIcon,
    MatProgressBar,
  ],
  templateUrl: './catalogue-page.html',
  styleUrl: './catalogue-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CataloguePage {
  private readonly api = inject(CatalogueApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly session = inject(Session);
  private readonly typedSearch = new Subject<string>();

  protected readonly processes = processChoices;
  protected readonly processLabel = processLabel;
  protected readonly maskingLabel = maskingLabel;
  protected readonly columns = ['name', 'maker', 'iso', 'process', 'masked', 'baseMaterial'];
  protected readonly dataSource = new MatTableDataSource<Stock>([]);
  protected readonly canAddStocks = computed(() => {
    const role = this.session.role();
    return role === 'manager' || role === 'admin';
  });

  /** What the search box shows, as typed. */
  protected readonly searchText = signal('');
  /** The search the server was asked for, a pause after typing. */
  protected readonly search = signal('');
  protected readonly process = signal<FilmProcess | ''>('');
  protected readonly masking = signal<StockFilters['masking']>('');
  private readonly reloads = signal(0);
  protected readonly filtered = computed(
    () => this.search().trim() !== '' || !!this.process() || !!this.masking(),
  );

  private readonly request = computed(() => ({
    filters: { q: this.search(), process: this.process(), masking: this.masking() } satisfies StockFilters,
    reload: this.reloads(),
  }));

  private readonly view: Signal<CatalogueView> = toSignal(
    toObservable(this.request).pipe(
      switchMap(({ filters }) =>
        this.api.stocks(filters).pipe(
          map((stocks): CatalogueView => ({ loading: false, stocks, problem: null })),
          catchError((err: unknown) =>
            of<CatalogueView>({ loading: false, stocks: [], problem: readProblem(err).message }),
          ),
          startWith<CatalogueView>({ loading: true, stocks: this.dataSource.data, problem: null }),
        ),
      ),
    ),
    { initialValue: { loading: true, stocks: [], problem: null } satisfies CatalogueView },
  );
  protected readonly loading = computed(() => this.view().loading);
  protected readonly problem = computed(() => this.view().problem);

  private readonly sort = viewChild.required(MatSort);

  constructor() {
    this.dataSource.sortingDataAccessor = (stock, column) => {
      if (column === 'process') return processLabel(stock.process);
      if (column === 'masked') return maskingLabel(stock);
      const value = stock[column as keyof Stock];
      return typeof value === 'number' ? value : String(value).toLowerCase();
    };
    effect(() => {
      this.dataSource.sort = this.sort();
    });
    effect(() => {
      this.dataSource.data = this.view().stocks;
    });
    this.typedSearch
      .pipe(debounceTime(searchPauseMs), distinctUntilChanged(), takeUntilDestroyed())
      .subscribe((value) => this.search.set(value));
  }

  protected onSearchInput(value: string): void {
    this.searchText.set(value);
    this.typedSearch.next(value);
  }

  protected clearFilters(): void {
    this.searchText.set('');
    this.typedSearch.next('');
    this.search.set('');
    this.process.set('');
    this.masking.set('');
  }

  protected openNewStock(): void {
    this.dialog
      .open<NewStockDialog, void, Stock>(NewStockDialog, { autoFocus: 'first-tabbable', width: '640px' })
      .afterClosed()
      .subscribe((stock) => {
        if (!stock) return;
        this.reloads.update((n) => n + 1);
        this.snackBar.open(`${stock.name} was added to the catalogue.`, undefined, { duration: 4000 });
      });
  }
}
