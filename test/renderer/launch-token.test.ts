// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest';
import { readLaunchToken, TOKEN_STORAGE_KEY } from '../../src-renderer/client/http-transport.ts';

afterEach(() => {
  window.sessionStorage.clear();
  window.history.replaceState(null, '', '/');
});

describe('readLaunchToken', () => {
  it('takes the token from the fragment and removes it from the address', () => {
    window.history.replaceState(null, '', '/#token=abc123');
    expect(readLaunchToken(window.location, window.history, window.sessionStorage)).toBe('abc123');
    expect(window.location.href).not.toContain('abc123');
    expect(window.location.hash).toBe('');
  });

  it('finds the token again after a reload (sessionStorage), and a new fragment wins over a stored one', () => {
    window.history.replaceState(null, '', '/#token=first');
    readLaunchToken(window.location, window.history, window.sessionStorage);
    expect(readLaunchToken(window.location, window.history, window.sessionStorage)).toBe('first');
    window.history.replaceState(null, '', '/#token=second');
    expect(readLaunchToken(window.location, window.history, window.sessionStorage)).toBe('second');
    expect(window.sessionStorage.getItem(TOKEN_STORAGE_KEY)).toBe('second');
  });

  it('has no token without the fragment, and none from a page meta tag', () => {
    // The web shell used to inject the token into the page, where any local account could fetch it.
    const meta = document.createElement('meta');
    meta.name = 'shelfwright-token';
    meta.content = 'from-the-server';
    document.head.append(meta);
    expect(readLaunchToken(window.location, window.history, window.sessionStorage)).toBeNull();
    meta.remove();
  });
});
