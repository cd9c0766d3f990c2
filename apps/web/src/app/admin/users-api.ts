import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type {
  CreateUserRequest,
  CreateUserResponse,
  UpdateUserRequest,
  UserListResponse,
  UserRecord,
} from '@clearbase/contracts';
import { map, type Observable } from 'rxjs';

/** The admin's calls on /api/users. */
@Injectable({ providedIn: 'root' })
export class UsersApi {
  private readonly http = inject(HttpClient);

  list(): Observable<UserRecord[]> {
    return this.http.get<UserListResponse>('/api/users').pipe(map((r) => r.users));
  }

  create(request: CreateUserRequest): Observable<CreateUserResponse> {
    return this.http.post<CreateUserResponse>('/api/users', request);
  }

  update(id: number, change: UpdateUserRequest): Observable<UserRecord> {
    return this.http.patch<{ user: UserRecord }>(`/api/users/${id}`, change).pipe(map((r) => r.user));
  }
}
