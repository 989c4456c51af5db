/** Sign in with a bearer token: the server names the identity and its roles (GET /console/session). */
import type { ScreenFactory } from '../app-context.ts';
import { h } from '../dom.ts';
import type { Identity } from '../plan-types.ts';

export const signInScreen: ScreenFactory = (ctx) => {
  const input = h('input', {
    id: 'token', name: 'token', type: 'password', autocomplete: 'off', spellcheck: 'false', required: true,
    'aria-describedby': 'token-help token-error',
  });
  const error = h('p', { id: 'token-error', class: 'field-error', role: 'alert' });
  const button = h('button', { type: 'submit', class: 'primary' }, 'Sign in');
  const form = h('form', { class: 'card narrow', novalidate: true },
    h('div', { class: 'field' },
      h('label', { for: 'token' }, 'Access token'),
      input,
      h('p', { id: 'token-help', class: 'help' }, 'Paste the token an administrator issued you (it starts with veer_). It is kept in this browser tab only and sent with each request.'),
      error),
    h('div', { class: 'actions' }, button));
  form.addEventListener('submit', (event) => {
    event.preventDefault();
    const token = input.value.trim();
    error.textContent = '';
    input.removeAttribute('aria-invalid');
    if (token === '') {
      error.textContent = 'Enter your access token.';
      input.setAttribute('aria-invalid', 'true');
      input.focus();
      return;
    }
    button.disabled = true;
    void (async () => {
      try {
        const res = await fetch('/console/session', { headers: { authorization: `Bearer ${token}` } });
        if (!res.ok) {
          error.textContent = res.status === 401 ? 'This token is unknown or has been revoked.' : `Sign-in failed (HTTP ${res.status}).`;
          input.setAttribute('aria-invalid', 'true');
          input.focus();
          return;
        }
        const identity = await res.json() as Identity;
        ctx.signIn({ token, name: identity.name, roles: identity.roles });
      } catch {
        error.textContent = 'The service did not answer; try again.';
      } finally {
        button.disabled = false;
      }
    })();
  });
  return {
    title: 'Sign in',
    node: h('section', { class: 'sign-in' },
      h('h1', { tabindex: '-1' }, 'Sign in'),
      h('p', { class: 'lede' }, 'Submit retargeting jobs, follow them as they run, and review the proposed burns.'),
      form),
  };
};
