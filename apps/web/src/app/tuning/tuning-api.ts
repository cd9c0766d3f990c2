import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type {
  Adjustments,
  Frame,
  FrameReviewRequest,
  FrameReviewResult,
  Job,
  Roll,
  RollTuning,
  ScannerProfile,
} from '@clearbase/contracts';
import type { FrameLevels, Rgb } from '@clearbase/inversion';
import { map, type Observable } from 'rxjs';
import type { PreviewNegative } from '../preview/preview-messages';
import { workingNegativeHeaders } from '@clearbase/contracts/values';

/** A frame's working negative with the base and levels the server renders it with. */
export interface WorkingNegative extends PreviewNegative {
  levels: FrameLevels;
  baseSource: string;
  scanWidth: number;
  scanHeight: number;
}

// header names of GET /api/frames/:id/working-negative
const headers = workingNegativeHeaders;

/** Calls of the tuning screen. */
@Injectable({ providedIn: 'root' })
export class TuningApi {
  private readonly http = inject(HttpClient);

  tuning(rollId: number): Observable<RollTuning> {
    return this.http.get<RollTuning>(`/api/rolls/${rollId}/tuning`);
  }

  workingNegative(frameId: number, scanner: ScannerProfile): Observable<WorkingNegative> {
    return this.http
      .get(`/api/frames/${frameId}/working-negative`, { responseType: 'arraybuffer', observe: 'response' })
      .pipe(
        map((res) => {
          const width = Number(res.headers.get(headers.width));
          const height = Number(res.headers.get(headers.height));
          const base = (res.headers.get(headers.base) ?? '').split(',').map(Number) as Rgb;
          const [scanWidth, scanHeight] = (res.headers.get(headers.scanSize) ?? '0x0').split('x').map(Number);
          const levels = JSON.parse(res.headers.get(headers.levels) ?? 'null') as FrameLevels;
          const pixels = new Uint16Array(res.body ?? new ArrayBuffer(0));
          if (pixels.length !== width * height * 3 || !levels)
            throw new Error('The working negative arrived incomplete.');
          return {
            width,
            height,
            pixels,
            base,
            scanner,
            levels,
            baseSource: res.headers.get(headers.baseSource) ?? '',
            scanWidth: scanWidth ?? width,
            scanHeight: scanHeight ?? height,
          };
        }),
      );
  }

  saveRoll(rollId: number, adjustments: Adjustments): Observable<Roll> {
    return this.http.put<Roll>(`/api/rolls/${rollId}/adjustments`, adjustments);
  }

  saveFrame(frameId: number, adjustments: Adjustments): Observable<Frame> {
    return this.http.put<Frame>(`/api/frames/${frameId}/adjustments`, adjustments);
  }

  /**
   * Renders again every frame not done (a saved change puts its frames back in the queue), each at its own levels
   * or all at the roll's.
   */
  invertPending(rollId: number, levels: 'frame' | 'roll'): Observable<Job> {
    return this.http.post<Job>(`/api/rolls/${rollId}/invert`, { frames: 'pending', levels });
  }

  /**
   * A frame's full-size JPEG output, as it is now: the output keeps its address when the frame renders again, so the
   * browser is told to ask the server rather than its cache.
   */
  fullSizeJpeg(frameId: number): Observable<Blob> {
    return this.http.get(`/api/frames/${frameId}/output`, {
      params: { format: 'jpeg' },
      headers: { 'Cache-Control': 'no-cache' },
      responseType: 'blob',
    });
  }

  review(frameId: number, request: FrameReviewRequest): Observable<FrameReviewResult> {
    return this.http.post<FrameReviewResult>(`/api/frames/${frameId}/review`, request);
  }
}
