/** What every screen receives from the shell. */
import type { Session } from './session.ts';

export interface ScreenContext {
  session: Session | null;
  /** Route parameters (`:jobId`, `:planId`). */
  params: Record<string, string>;
  navigate(hash: string): void;
  signIn(session: Session): void;
  signOut(): void;
}

export interface Screen {
  title: string;
  node: Node;
  /** Stops streams and timers when the screen is left. */
  dispose?(): void;
}

export type ScreenFactory = (ctx: ScreenContext) => Screen;
