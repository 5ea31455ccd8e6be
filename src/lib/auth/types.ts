// What the sign-in and account routes send to the browser (islands import these, never lib/server).

/** An open session as My account lists it: never its id, which is the credential, only a handle derived from it. */
export interface SessionView {
  handle: string;
  current: boolean;
  createdAt: string;
  lastSeenAt: string;
  expiresAt: string;
  ip: string | null;
  userAgent: string | null;
  sharedBench: boolean;
}

/** One sign-in or failed attempt on the account. */
export interface SignInView {
  at: string;
  ip: string;
  userAgent: string | null;
  succeeded: boolean;
  step: "password" | "code";
}

/** A new two-factor key waiting for its first code. */
export interface NewKey {
  /** The secret in groups of four, for typing into an app by hand. */
  secret: string;
  /** The otpauth:// address the QR code holds. */
  uri: string;
  /** The QR code as one SVG path on a square of `size` modules (drawn on the server, nothing leaves it). */
  qr: { size: number; path: string };
}

export interface TwoFactorView {
  enabled: boolean;
  enabledAt: string | null;
  recoveryCodesLeft: number;
  /** The account's role must sign in with two-factor (an administrator's setting). */
  required: boolean;
}

export interface AccountSecurityView {
  twoFactor: TwoFactorView;
  sessions: SessionView[];
  signIns: SignInView[];
  limits: { idle_min: number; absolute_days: number; sharedBenchIdle_min: number };
}
