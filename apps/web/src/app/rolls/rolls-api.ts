import { HttpClient, HttpEventType } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type {
  InvertRollRequest,
  Job,
  Roll,
  RollBaseRequest,
  RollDetail,
  UploadResult,
} from '@clearbase/contracts';
import { catchError, concat, defer, filter, map, type Observable, of } from 'rxjs';
import { readProblem } from '../problem/read-problem';
import type { UploadAction } from './upload-state';

/** A file picked for upload, with the key the upload list knows it by. */
export interface KeyedFile {
  key: number;
  file: File;
}

/** Calls on a roll: its frames, uploads, batch inversion, its base. */
@Injectable({ providedIn: 'root' })
export class RollsApi {
  private readonly http = inject(HttpClient);

  roll(id: number): Observable<RollDetail> {
    return this.http.get<RollDetail>(`/api/rolls/${id}`);
  }

  /**
   * POST /api/rolls/:id/frames with the files in one multipart request, told as upload actions: started, byte
   * progress, then the server's verdict on each file (or the problem that refused them). Never errors.
   */
  upload(rollId: number, files: readonly KeyedFile[]): Observable<UploadAction> {
    const keys = files.map((f) => f.key);
    return defer(() => {
      const body = new FormData();
      for (const { file } of files) body.append('files', file, file.name);
      const sending = this.http
        .post<UploadResult>(`/api/rolls/${rollId}/frames`, body, { reportProgress: true, observe: 'events' })
        .pipe(
          map((event): UploadAction | null => {
            if (event.type === HttpEventType.UploadProgress) {
              return { type: 'progress', keys, loaded: event.loaded, total: event.total ?? null };
            }
            if (event.type === HttpEventType.Response && event.body) {
              return { type: 'answered', keys, result: event.body };
            }
            return null;
          }),
          filter((a): a is UploadAction => a !== null),
          catchError((err: unknown) => {
            const p = readProblem(err);
            return of<UploadAction>({ type: 'failed', keys, message: p.message, fileReasons: p.fieldErrors });
          }),
        );
      return concat(of<UploadAction>({ type: 'started', keys }), sending);
    });
  }

  /**
   * Starts (or joins) the roll's batch inversion; the server answers 202 with the job. `levels` says whose levels set
   * exposure, neutral balance and black and white points: each frame's own, the whole roll's together, or none
   * (`metered`: fixed at the profile's metered exposure for the roll's EI).
   */
  invert(rollId: number, request: InvertRollRequest): Observable<Job> {
    return this.http.post<Job>(`/api/rolls/${rollId}/invert`, request);
  }

  cancelJob(jobId: number): Observable<Job> {
    return this.http.post<Job>(`/api/jobs/${jobId}/cancel`, null);
  }

  setBase(rollId: number, request: RollBaseRequest): Observable<Roll> {
    return this.http.put<Roll>(`/api/rolls/${rollId}/base`, request);
  }
}
