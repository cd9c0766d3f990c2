import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable, toSignal } from '@angular/core/rxjs-interop';
import { MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';
import { MatMenu, MatMenuItem, MatMenuTrigger } from '@angular/material/menu';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import type {
  OrderBalance,
  OrderDetail,
  OrderReadiness,
  OrderStatus,
  Payment,
  PaymentListResponse,
  Roll,
  Scanner,
} from '@clearbase/contracts';
import { catchError, combineLatest, map, of, scan, startWith, Subject, switchMap } from 'rxjs';
import { ConfirmDialog, type ConfirmDialogData } from '../admin/confirm-dialog';
import { OrderReadinessApi } from '../admin/order-readiness-api';
import { paymentStatusLabel, refundable } from '../admin/payment-status-label';
import { RefundDialog, type RefundDialogData } from '../admin/refund-dialog';
import { Session } from '../auth/session';
import { showMoney } from '../prices/money';
import { OrderPaymentPanel } from '../prices/order-payment-panel';
import { PaymentsApi } from '../prices/payments-api';
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
  private readonly readinessApi = inject(OrderReadinessApi);
  private readonly paymentsApi = inject(PaymentsApi);

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
  protected readonly canRefund = computed(() => ['manager', 'admin'].includes(this.session.role() ?? ''));
  protected readonly paymentStatusLabel = paymentStatusLabel;
  protected readonly refundable = refundable;
  protected readonly showMoney = showMoney;

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
  /** The next status, except Ready: an order becomes ready through Mark ready, which mails the customer. */
  protected readonly next = computed(() => {
    const order = this.order();
    const next = order && !orderClosed(order.status) ? nextOrderStatus(order.status) : null;
    return next === 'ready' ? null : next;
  });
  /**
   * Statuses an open order may be moved to other than the next one, as the server allows: Ready only through Mark
   * ready, Delivered only once it is ready.
   */
  protected readonly otherMoves = computed(() => {
    const order = this.order();
    if (!order || orderClosed(order.status)) return [];
    return orderStatusChoices.filter(
      (s) =>
        s !== order.status &&
        s !== this.next() &&
        s !== 'ready' &&
        (s !== 'delivered' || order.status === 'ready'),
    );
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

  /** Staff only: whether every roll is approved, reloaded with the order. */
  protected readonly readiness = toSignal(
    combineLatest([
      toObservable(this.id),
      toObservable(this.staff),
      this.reloads.pipe(startWith(undefined)),
    ]).pipe(
      switchMap(([id, staff]) =>
        staff
          ? this.readinessApi.readiness(Number(id)).pipe(catchError(() => of<OrderReadiness | null>(null)))
          : of<OrderReadiness | null>(null),
      ),
    ),
    { initialValue: null },
  );
  /** Mark ready is offered on open orders; closed ones stay as they are. */
  protected readonly canMarkReady = computed(() => {
    const order = this.order();
    return this.staff() && !!order && !orderClosed(order.status);
  });
  /** Why Mark ready is greyed out: the order's own reason, or each roll still waiting. */
  protected readonly notReadyReason = computed(() => {
    const r = this.readiness();
    if (!r) return 'Checking the rolls…';
    if (r.ready) return null;
    if (r.blocker) return r.blocker;
    return `Not yet: ${r.waiting.map((w) => `roll ${w.rollNumber} ${w.reason}`).join('; ')}.`;
  });
  protected readonly marking = signal(false);

  /** Staff only: the order's payments; a customer's page has the payment panel instead. */
  protected readonly payments = signal<Payment[]>([]);
  /** Staff only: what is left to pay, shown when something is (rolls added after paying, or nothing paid yet). */
  protected readonly balance = signal<OrderBalance | null>(null);

  constructor() {
    const none: PaymentListResponse | null = null;
    combineLatest([toObservable(this.id), toObservable(this.staff), this.reloads.pipe(startWith(undefined))])
      .pipe(
        switchMap(([id, staff]) =>
          staff ? this.paymentsApi.overview(Number(id)).pipe(catchError(() => of(none))) : of(none),
        ),
        takeUntilDestroyed(),
      )
      .subscribe((overview) => {
        this.payments.set(overview?.payments ?? []);
        this.balance.set(overview?.balance ?? null);
      });
  }

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

  /** Asks first, since the customer is mailed at once; then the status timeline shows the order ready. */
  protected markReady(): void {
    const order = this.order();
    const readiness = this.readiness();
    if (!order || !readiness?.ready || this.marking()) return;
    const again = order.status === 'ready';
    const days = readiness.linkValidHours / 24;
    const lasting = Number.isInteger(days)
      ? `${days} day${days === 1 ? '' : 's'}`
      : `${readiness.linkValidHours} hours`;
    this.dialog
      .open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, {
        data: {
          title: again ? `Send order ${order.id}'s link again?` : `Mark order ${order.id} ready?`,
          message:
            `${order.customerName} will get an e-mail with a link to download the scans of this order; the link ` +
            `works for ${lasting}.` +
            (again ? ' Links sent before keep working until they expire.' : ' The order becomes Ready.'),
          confirmLabel: again ? 'Send the link' : 'Mark ready and send',
        },
        autoFocus: 'first-tabbable',
      })
      .afterClosed()
      .subscribe((confirmed) => {
        if (!confirmed) return;
        this.marking.set(true);
        this.readinessApi.markReady(order.id).subscribe({
          next: () => {
            this.marking.set(false);
            this.reloads.next();
            this.snackBar.open(
              `Order ${order.id} is ready; the e-mail to ${order.customerName} is on its way.`,
              undefined,
              { duration: 5000 },
            );
          },
          error: (err: unknown) => {
            this.marking.set(false);
            this.reloads.next();
            this.snackBar.open(readProblem(err).message, 'Close', { duration: 8000 });
          },
        });
      });
  }

  protected refund(payment: Payment): void {
    const order = this.order();
    if (!order) return;
    this.dialog
      .open<RefundDialog, RefundDialogData, Payment>(RefundDialog, {
        data: { payment, customerName: order.customerName },
        autoFocus: 'first-tabbable',
        width: '480px',
      })
      .afterClosed()
      .subscribe((updated) => {
        if (!updated) return;
        this.payments.update((list) => list.map((p) => (p.id === updated.id ? updated : p)));
        this.snackBar.open(
          `${showMoney(updated.refundedMinor - payment.refundedMinor, updated.currency)} refunded to ${order.customerName}.`,
          undefined,
          { duration: 5000 },
        );
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
