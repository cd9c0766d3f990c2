import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type {
  Calibration,
  CalibrationListResponse,
  CalibrationSummary,
  CreateCalibrationRequest,
  Stock,
} from '@clearbase/contracts';
import { map, type Observable } from 'rxjs';
import { calibrationPreviewHeaders } from '@clearbase/contracts/values';

/** A scan's preview before submitting: an object URL of the JPEG and the scan's full size in pixels. */
export interface FramePreview {
  url: string;
  width: number;
  height: number;
}

/** The JSON the form sends beside the files (before the server's defaults). */
export type CalibrationRequestBody = Omit<
  CreateCalibrationRequest,
  'scannerId' | 'baseRegion' | 'bracket'
> & {
  scannerId?: number | null;
  bracket: { stops: number }[];
};

/** A calibration roll whose frames the lab already holds, ready to mark and fit (GET /api/calibration-rolls). */
export interface CalibrationRollOnFile {
  id: number;
  stockId: number;
  stockName: string;
  scannerId: number | null;
  title: string;
  note: string;
  frames: {
    n: number;
    role: 'bracket' | 'chart' | 'leader';
    fileId: number;
    fileName: string;
    width: number;
    height: number;
    stops: number | null;
  }[];
  createdAt: string;
}

/** Calls on calibrations: fitting a roll into a draft profile, its record, report and frame previews. */
@Injectable({ providedIn: 'root' })
export class CalibrationApi {
  private readonly http = inject(HttpClient);

  list(stockId?: number): Observable<CalibrationSummary[]> {
    let params = new HttpParams();
    if (stockId) params = params.set('stockId', stockId);
    return this.http
      .get<CalibrationListResponse>('/api/calibrations', { params })
      .pipe(map((r) => r.calibrations));
  }

  get(id: number): Observable<Calibration> {
    return this.http.get<Calibration>(`/api/calibrations/${id}`);
  }

  /** Calibration rolls on file, oldest first. */
  rollsOnFile(): Observable<CalibrationRollOnFile[]> {
    return this.http
      .get<{ rolls: CalibrationRollOnFile[] }>('/api/calibration-rolls')
      .pipe(map((r) => r.rolls));
  }

  /** One frame of a roll on file as a File, to go through the same steps as a scan chosen from disk. */
  frameOnFile(roll: CalibrationRollOnFile, frame: CalibrationRollOnFile['frames'][number]): Observable<File> {
    return this.http
      .get(`/api/calibration-rolls/${roll.id}/frames/${frame.n}`, { responseType: 'blob' })
      .pipe(map((blob) => new File([blob], frame.fileName, { type: blob.type || 'image/tiff' })));
  }

  /** The stocks a calibration can be for. */
  stocks(): Observable<Stock[]> {
    return this.http.get<{ stocks: Stock[] }>('/api/stocks').pipe(map((r) => r.stocks));
  }

  /** POST /api/calibrations: the grey frames in bracket order, the chart, the leader if any, and the JSON marks. */
  create(
    body: CalibrationRequestBody,
    files: { bracket: readonly File[]; chart: File; leader: File | null },
  ): Observable<Calibration> {
    const form = new FormData();
    form.append('calibration', JSON.stringify(body));
    for (const f of files.bracket) form.append('bracket', f, f.name);
    form.append('chart', files.chart, files.chart.name);
    if (files.leader) form.append('leader', files.leader, files.leader.name);
    return this.http.post<Calibration>('/api/calibrations', form);
  }

  /** A JPEG preview of a scan not yet submitted, with the scan's size from the response headers. */
  framePreview(file: File): Observable<FramePreview> {
    const form = new FormData();
    form.append('file', file, file.name);
    return this.http
      .post('/api/calibrations/frame-preview', form, { observe: 'response', responseType: 'blob' })
      .pipe(
        map((res) => ({
          url: URL.createObjectURL(res.body!),
          width: Number(res.headers.get(calibrationPreviewHeaders.width)),
          height: Number(res.headers.get(calibrationPreviewHeaders.height)),
        })),
      );
  }

  frameUrl(id: number, n: number): string {
    return `/api/calibrations/${id}/frames/${n}/preview`;
  }

  reportUrl(id: number): string {
    return `/api/calibrations/${id}/report.pdf`;
  }
}
