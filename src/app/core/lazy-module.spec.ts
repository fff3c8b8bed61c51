import { ApplicationRef, Component } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { lazyModule } from './lazy-module';

describe('lazyModule', () => {
  it('imports once, however often it is asked, and keeps the module', async () => {
    let calls = 0;
    const mod = lazyModule(async () => {
      calls++;
      return { answer: 42 };
    });
    expect(mod.value()).toBeNull();
    const [a, b] = await Promise.all([mod.load(), mod.load()]);
    expect(a).toBe(b);
    expect(await mod.load()).toBe(a);
    expect(mod.value()).toEqual({ answer: 42 });
    expect(calls).toBe(1);
  });

  it('tries again after a failed import', async () => {
    let calls = 0;
    const mod = lazyModule(async () => {
      if (++calls === 1) throw new Error('offline');
      return 'in';
    });
    await expect(mod.load()).rejects.toThrow('offline');
    expect(mod.value()).toBeNull();
    expect(await mod.load()).toBe('in');
    expect(calls).toBe(2);
  });

  it('holds the app unstable while a preloaded module is on its way', async () => {
    let arrive!: (v: string) => void;
    const mod = lazyModule(() => new Promise<string>((r) => (arrive = r)));
    @Component({ template: '{{ mod.value() ?? "waiting" }}' })
    class Host {
      protected readonly mod = mod;
      constructor() {
        mod.preload();
      }
    }
    const fixture = TestBed.createComponent(Host);
    let stable = false;
    const waiting = TestBed.inject(ApplicationRef)
      .whenStable()
      .then(() => (stable = true));
    await new Promise((r) => setTimeout(r, 20));
    expect(stable).toBe(false);
    arrive('in');
    await waiting;
    await fixture.whenStable();
    expect(fixture.nativeElement.textContent).toBe('in');
  });
});
