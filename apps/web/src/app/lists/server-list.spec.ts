import { HttpErrorResponse } from '@angular/common/http';
import { provideZonelessChangeDetection, signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { Subject } from 'rxjs';
import { serverList } from './server-list';

function setUp() {
  TestBed.configureTestingModule({ providers: [provideZonelessChangeDetection()] });
  const request = signal('first');
  const asked: { request: string; answer: Subject<string[]> }[] = [];
  const list = TestBed.runInInjectionContext(() =>
    serverList({
      request,
      load: (r: string) => {
        const answer = new Subject<string[]>();
        asked.push({ request: r, answer });
        return answer;
      },
      empty: [] as string[],
    }),
  );
  TestBed.tick();
  return { request, asked, list };
}

describe('serverList', () => {
  it('asks for each new request, keeping the last answer on show while the next is on its way', () => {
    const { request, asked, list } = setUp();
    expect(asked.map((a) => a.request)).toEqual(['first']);
    expect(list.loading()).toBe(true);
    asked[0]!.answer.next(['a', 'b']);
    expect(list.value()).toEqual(['a', 'b']);
    expect(list.loading()).toBe(false);

    request.set('second');
    TestBed.tick();
    expect(asked.map((a) => a.request)).toEqual(['first', 'second']);
    expect(list.loading()).toBe(true);
    expect(list.value()).toEqual(['a', 'b']);
  });

  it('drops the answer to a superseded request', () => {
    const { request, asked, list } = setUp();
    request.set('second');
    TestBed.tick();
    asked[0]!.answer.next(['stale']);
    expect(list.value()).toEqual([]);
    asked[1]!.answer.next(['fresh']);
    expect(list.value()).toEqual(['fresh']);
  });

  it('shows the server’s sentence and nothing of the list when refused, and asks again on reload', () => {
    const { asked, list } = setUp();
    asked[0]!.answer.next(['a']);
    list.reload();
    TestBed.tick();
    asked[1]!.answer.error(
      new HttpErrorResponse({
        status: 503,
        error: { type: 'about:blank', title: 'Unavailable', status: 503, detail: 'The lab is closed.' },
      }),
    );
    expect(list.problem()).toBe('The lab is closed.');
    expect(list.value()).toEqual([]);
    expect(list.loading()).toBe(false);

    list.reload();
    TestBed.tick();
    expect(asked.map((a) => a.request)).toEqual(['first', 'first', 'first']);
    expect(list.problem()).toBeNull();
  });
});
