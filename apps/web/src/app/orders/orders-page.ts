import { DatePipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  signal,
  type Signal,
} from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { MatButton } from '@angular/material/button';
import { MatFormField, MatLabel, MatPrefix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatOption, MatSelect } from '@angular/material/select';
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
import type { Order, OrderStatus } from '@clearbase/contracts';
import { catchError, map, of, startWith, switchMap } from 'rxjs';
import { Session } from '../auth/session';
import { readProblem } from '../problem/read-problem';
import {
  isStaffRole,
  orderColumns,
  orderStatusChoices,
  orderStatusLabel,
  orderStatusTone,
  outputFormatLabel,
} from './order-labels';
import { OrdersApi } from './orders-api';

interface OrdersView {
  loading: boolean;
  orders: Order[];
  total: number;
  problem: string | null;
}

/** Every signed-in user: staff see every order, filtered by status and found by customer; a customer their own. */
@Component({
  selector: 'cb-orders-page',
  imports: [
    DatePipe,
    RouterLink,
    MatButton,
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
    MatFormField,
    MatLabel,
    MatPrefix,
    MatInput,
    MatSelect,
    MatOption,
    MatIcon,
    MatProgressBar,
  ],
  templateUrl: './orders-page.html',
  styleUrls: ['./orders-page.scss', '../rolls/status-chips.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OrdersPage {
  private readonly api = inject(OrdersApi);
  private readonly session = inject(Session);

  protected readonly statuses = orderStatusChoices;
  protected readonly statusLabel = orderStatusLabel;
  protected readonly statusTone = orderStatusTone;
  protected readonly formatLabel = outputFormatLabel;
  protected readonly staff = computed(() => isStaffRole(this.session.role()));
  protected readonly columns = computed(() => orderColumns(this.session.role()));
  protected readonly dataSource = new MatTableDataSource<Order>([]);

  protected readonly status = signal<OrderStatus | ''>('');
  /** Part of a customer's name; the list on screen is narrowed as it is typed. */
  protected readonly customer = signal('');

  private readonly view: Signal<OrdersView> = toSignal(
    toObservable(this.status).pipe(
      switchMap((status) =>
        this.api.list(status).pipe(
          map((r): OrdersView => ({ loading: false, orders: r.orders, total: r.total, problem: null })),
          catchError((err: unknown) =>
            of<OrdersView>({ loading: false, orders: [], total: 0, problem: readProblem(err).message }),
          ),
          startWith<OrdersView>({ loading: true, orders: this.dataSource.data, total: 0, problem: null }),
        ),
      ),
    ),
    { initialValue: { loading: true, orders: [], total: 0, problem: null } satisfies OrdersView },
  );
  protected readonly loading = computed(() => this.view().loading);
  protected readonly problem = computed(() => this.view().problem);
  protected readonly more = computed(() => this.view().total - this.view().orders.length);
  protected readonly filtered = computed(() => !!this.status() || this.customer().trim() !== '');

  constructor() {
    this.dataSource.filterPredicate = (order, text) => order.customerName.toLowerCase().includes(text);
    effect(() => {
      this.dataSource.data = this.view().orders;
    });
    effect(() => {
      this.dataSource.filter = this.customer().trim().toLowerCase();
    });
  }

  protected clearFilters(): void {
    this.status.set('');
    this.customer.set('');
  }
}
