import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { MatAnchor, MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { ProfileVersionSummary, Role, StockDetail } from '@clearbase/contracts';
import { versionActions } from './version-actions';

/** A stock profile with its versions, as the stock page receives it. */
export type ProfileWithVersions = StockDetail['profiles'][number];

const statusLabels: Record<ProfileVersionSummary['status'], string> = {
  draft: 'Draft',
  published: 'Published',
  retired: 'Retired',
};

/** A profile's versions, newest first, as a vertical timeline with what the viewer's role may do to each. */
@Component({
  selector: 'cb-version-timeline',
  imports: [DatePipe, RouterLink, MatButton, MatAnchor, MatIcon],
  templateUrl: './version-timeline.html',
  styleUrl: './version-timeline.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VersionTimeline {
  readonly profile = input.required<ProfileWithVersions>();
  readonly role = input.required<Role | null>();
  /** Versions with a change on its way to the server: their buttons wait. */
  readonly pending = input<ReadonlySet<number>>(new Set());
  /** Where the browser downloads a version's document. */
  readonly exportUrl = input.required<(versionId: number) => string>();
  /** The calibration each version was fitted from, by version id: those versions link to their report. */
  readonly calibrations = input<ReadonlyMap<number, number>>(new Map());

  readonly newDraft = output<ProfileVersionSummary>();
  readonly retire = output<ProfileVersionSummary>();

  protected readonly statusLabels = statusLabels;
  protected readonly entries = computed(() => {
    const versions = this.profile().versions;
    const numberOf = new Map(versions.map((v) => [v.id, v.version]));
    return [...versions]
      .sort((a, b) => b.version - a.version)
      .map((v) => ({
        version: v,
        parentNumber: v.parentVersionId === null ? null : (numberOf.get(v.parentVersionId) ?? null),
        actions: versionActions(v, this.role()),
        calibrationId: this.calibrations().get(v.id) ?? null,
      }));
  });
}
