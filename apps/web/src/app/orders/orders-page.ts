import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, signal } from '@angular/core';
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
import type { Order, OrderListResponse, OrderStatus } from '@clearbase/contracts';
import { Session } from '../auth/session';
import { serverList } from '../lists/server-list';
import {
  isStaffRole,
  orderColumns,
  orderStatusChoices,
  orderStatusLabel,
  orderStatusTone,
  outputFormatLabel,
} from './order-labels';
import { OrdersApi } from './orders-api';

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

  private readonly list = serverList({
    request: this.status,
    load: (status: OrderStatus | '') => this.api.list(status),
    empty: { orders: [], total: 0 } as OrderListResponse,
  });
  protected readonly loading = this.list.loading;
  protected readonly problem = this.list.problem;
  protected readonly more = computed(() => this.list.value().total - this.list.value().orders.length);
  protected readonly filtered = computed(() => !!this.status() || this.customer().trim() !== '');

  constructor() {
    this.dataSource.filterPredicate = (order, text) => order.customerName.toLowerCase().includes(text);
    effect(() => {
      this.dataSource.data = this.list.value().orders;
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
