import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { formatSeconds, ReciprocityCalculator } from './reciprocity-calculator';

async function render(exponent: number) {
  TestBed.configureTestingModule({
    imports: [ReciprocityCalculator],
    providers: [provideZonelessChangeDetection()],
  });
  const fixture = TestBed.createComponent(ReciprocityCalculator);
  fixture.componentRef.setInput('exponent', exponent);
  await fixture.whenStable();
  const loader = TestbedHarnessEnvironment.loader(fixture);
  const input = await loader.getHarness(MatInputHarness);
  const text = (id: string) =>
    (fixture.nativeElement as HTMLElement).querySelector(`[data-testid="${id}"]`)?.textContent?.trim() ??
    null;
  return { fixture, loader, input, text };
}

describe('ReciprocityCalculator', () => {
  it('turns 10 s metered at p = 1.3 into 19.95 s', async () => {
    // t_c = t_m^p, p ≈ 1.3 (practical form of Schwarzschild's law, common practice of the trade): 10^1.3 = 19.95
    const { input, text, fixture } = await render(1.3);
    await input.setValue('10');
    await fixture.whenStable();
    expect(text('reciprocity-corrected')).toBe('19.95 s');
    expect(text('reciprocity-extra')).toBe('1.0 stops more light');
  });

  it('follows the stock’s exponent', async () => {
    const { input, text, fixture } = await render(1.5);
    await input.setValue('4');
    await fixture.whenStable();
    expect(text('reciprocity-corrected')).toBe('8.00 s');
  });

  it('applies no correction at one second or less', async () => {
    const { input, text, fixture } = await render(1.3);
    await input.setValue('0.5');
    await fixture.whenStable();
    expect(text('reciprocity-corrected')).toBe('0.50 s');
    expect(text('reciprocity-none')).toBe('No correction at 1 s or less');
  });

  it('asks for a time above zero and shows no result for it', async () => {
    const { input, text, fixture, loader } = await render(1.3);
    await input.setValue('0');
    await input.blur();
    await fixture.whenStable();
    expect(text('reciprocity-corrected')).toBeNull();
    const field = await loader.getHarness(MatFormFieldHarness);
    expect(await field.getTextErrors()).toEqual(['Enter a time above 0 s']);
  });

  it('writes minutes beside long times', () => {
    expect(formatSeconds(125.4)).toBe('125.40 s (2 min 5 s)');
    expect(formatSeconds(19.9526)).toBe('19.95 s');
  });
});
