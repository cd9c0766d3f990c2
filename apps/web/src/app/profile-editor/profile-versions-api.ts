import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { ProfileDiff, ProfileDocument, ProfileVersion, ScannerProfile } from '@clearbase/contracts';
import type { Rgb } from '@clearbase/inversion';
import { map, type Observable } from 'rxjs';
import type { PreviewNegative } from '../preview/preview-messages';
import { referenceNegativeHeaders } from '@clearbase/contracts/values';

/** The reference negative a version previews on, as the server sends it. */
export type ReferenceNegative = PreviewNegative;

// The server's reference negatives come through a linear scanner: no black level, unit gains.
const linearScanner: ScannerProfile = {
  name: 'Reference negative',
  encoding: 'linear',
  gamma: 1,
  blackLevel: [0, 0, 0],
  gains: [1, 1, 1],
};

/** The editor's calls on /api/profile-versions and /api/profiles. */
@Injectable({ providedIn: 'root' })
export class ProfileVersionsApi {
  private readonly http = inject(HttpClient);

  get(id: number): Observable<ProfileVersion> {
    return this.http
      .get<{ version: ProfileVersion }>(`/api/profile-versions/${id}`)
      .pipe(map((r) => r.version));
  }

  /** PATCH a draft's parameters; a published version answers 409, schema errors 400 with paths. */
  update(id: number, parameters: ProfileDocument): Observable<ProfileVersion> {
    return this.http
      .patch<{ version: ProfileVersion }>(`/api/profile-versions/${id}`, { parameters })
      .pipe(map((r) => r.version));
  }

  publish(id: number, changelog: string): Observable<ProfileVersion> {
    return this.http
      .post<{ version: ProfileVersion }>(`/api/profile-versions/${id}/publish`, { changelog })
      .pipe(map((r) => r.version));
  }

  /** A new draft of the same profile, from any of its versions. */
  newDraft(profileId: number, parentVersionId: number): Observable<ProfileVersion> {
    return this.http
      .post<{ version: ProfileVersion }>(`/api/profiles/${profileId}/versions`, { parentVersionId })
      .pipe(map((r) => r.version));
  }

  /** Parameter by parameter, what changed from version `from` to version `to`. */
  diff(from: number, to: number): Observable<ProfileDiff> {
    return this.http.get<ProfileDiff>(`/api/profile-versions/${from}/diff/${to}`);
  }

  /**
   * The version's reference negative, its stock's film with the version's own crosstalk: raw little-endian 16-bit
   * RGB, size and base in headers.
   */
  referenceNegative(id: number): Observable<ReferenceNegative> {
    return this.http
      .get(`/api/profile-versions/${id}/reference-negative`, {
        responseType: 'arraybuffer',
        observe: 'response',
      })
      .pipe(
        map((res) => {
          const width = Number(res.headers.get(referenceNegativeHeaders.width));
          const height = Number(res.headers.get(referenceNegativeHeaders.height));
          const base = (res.headers.get(referenceNegativeHeaders.base) ?? '').split(',').map(Number);
          const body = res.body ?? new ArrayBuffer(0);
          if (
            !(width > 0 && height > 0) ||
            base.length !== 3 ||
            !base.every((b) => b > 0 && b <= 1) ||
            body.byteLength !== width * height * 6
          ) {
            throw new Error('The reference negative arrived incomplete.');
          }
          return { width, height, pixels: new Uint16Array(body), base: base as Rgb, scanner: linearScanner };
        }),
      );
  }
}
