import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';
import { MatMenu, MatMenuItem, MatMenuTrigger } from '@angular/material/menu';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import type { OrderDetail, OrderStatus, Roll, Scanner } from '@clearbase/contracts';
import { catchError, combineLatest, map, of, scan, startWith, Subject, switchMap } from 'rxjs';
import { Session } from '../auth/session';
import { OrderPaymentPanel } from '../prices/order-payment-panel';
import { readProblem, type ProblemMessage } from '../problem/read-problem';
import { pushPullLabel, rollStatusLabel } from '../rolls/roll-labels';
import { ScannersApi } from '../scanners/scanners-api';
import { AddRollDialog, type AddRollData } from './add-roll-dialog';
import {
  isStaffRole,
  negativesLabel,
  nextOrderStatus,
  orderClosed,
  orderStatusChoices,
  orderStatusLabel,
  orderStatusTone,
  orderTimeline,
  outputFormatLabel,
  scanSizeLabel,
} from './order-labels';
import { OrdersApi } from './orders-api';

interface OrderView {
  loading: boolean;
  detail: OrderDetail | null;
  problem: ProblemMessage | null;
}

const initialView: OrderView = { loading: true, detail: null, problem: null };

/** One order: what was asked for, where it stands, its rolls; staff add rolls and move it on. */
@Component({
  selector: 'cb-order-page',
  imports: [
    DatePipe,
    RouterLink,
    MatButton,
    MatIcon,
    MatMenu,
    MatMenuItem,
    MatMenuTrigger,
    MatProgressBar,
    OrderPaymentPanel,
  ],
  templateUrl: './order-page.html',
  styleUrls: ['./order-page.scss', '../rolls/status-chips.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OrderPage {
  private readonly api = inject(OrdersApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly session = inject(Session);
  private readonly scannersApi = inject(ScannersApi);

  /** The order id, from the route. */
  readonly id = input.required<string>();
  private readonly reloads = new Subject<void>();

  protected readonly statusLabel = orderStatusLabel;
  protected readonly statusTone = orderStatusTone;
  protected readonly formatLabel = outputFormatLabel;
  protected readonly scanSizeLabel = scanSizeLabel;
  protected readonly negativesLabel = negativesLabel;
  protected readonly rollStatusLabel = rollStatusLabel;
  protected readonly pushPullLabel = pushPullLabel;
  protected readonly staff = computed(() => isStaffRole(this.session.role()));

  private readonly state = toSignal(
    combineLatest([toObservable(this.id), this.reloads.pipe(startWith(undefined))]).pipe(
      switchMap(([id]) =>
        this.api.order(Number(id)).pipe(
          map((detail): Partial<OrderView> => ({ loading: false, detail, problem: null })),
          catchError((err: unknown) => of<Partial<OrderView>>({ loading: false, problem: readProblem(err) })),
          // while reloading, the order stays on screen
          startWith<Partial<OrderView>>({ loading: true }),
        ),
      ),
      scan((view: OrderView, change) => ({ ...view, ...change }), initialView),
    ),
    { initialValue: initialView },
  );
  protected readonly loading = computed(() => this.state().loading);
  protected readonly problem = computed(() => this.state().problem);
  protected readonly order = computed(() => this.state().detail?.order ?? null);
  protected readonly rolls = computed(() => this.state().detail?.rolls ?? []);
  protected readonly timeline = computed(() => {
    const order = this.order();
    return order ? orderTimeline(order.status) : [];
  });
  protected readonly next = computed(() => {
    const order = this.order();
    return order && !orderClosed(order.status) ? nextOrderStatus(order.status) : null;
  });
  /** Statuses an open order may be moved to other than the next one. */
  protected readonly otherMoves = computed(() => {
    const order = this.order();
    if (!order || orderClosed(order.status)) return [];
    return orderStatusChoices.filter((s) => s !== order.status && s !== this.next());
  });
  protected readonly moving = signal(false);
  /** Customers see the gallery once the scans are ready; staff may look at any time. */
  protected readonly galleryOpen = computed(() => {
    const order = this.order();
    return !!order && (this.staff() || order.status === 'ready' || order.status === 'delivered');
  });

  /** Scanner names, for staff (customers are not shown which scanner the lab used). */
  private readonly scanners = toSignal(
    toObservable(this.staff).pipe(
      switchMap((staff) => (staff ? this.scannersApi.list() : of<Scanner[]>([]))),
      catchError(() => of<Scanner[]>([])),
    ),
    { initialValue: [] as Scanner[] },
  );

  protected scannerName(roll: Roll): string {
    if (roll.scannerId === null) return 'Not chosen';
    return this.scanners().find((s) => s.id === roll.scannerId)?.name ?? `Scanner ${roll.scannerId}`;
  }

  protected moveTo(status: OrderStatus): void {
    const order = this.order();
    if (!order || this.moving()) return;
    this.moving.set(true);
    this.api.setStatus(order.id, status).subscribe({
      next: (after) => {
        this.moving.set(false);
        this.reloads.next();
        this.snackBar.open(
          `Order ${after.id} is now ${orderStatusLabel(after.status).toLowerCase()}.`,
          undefined,
          {
            duration: 4000,
          },
        );
      },
      error: (err: unknown) => {
        this.moving.set(false);
        this.snackBar.open(readProblem(err).message, 'Close', { duration: 8000 });
      },
    });
  }

  protected addRoll(): void {
    const order = this.order();
    if (!order) return;
    this.dialog
      .open<AddRollDialog, AddRollData, Roll>(AddRollDialog, {
        data: { orderId: order.id },
        autoFocus: 'first-tabbable',
        width: '560px',
      })
      .afterClosed()
      .subscribe((roll) => {
        if (!roll) return;
        this.reloads.next();
        this.snackBar.open(`Roll ${roll.id} of ${roll.stockName} was added.`, undefined, { duration: 4000 });
      });
  }
}
