import { HttpContext, HttpContextToken } from '@angular/common/http';

/** Marks a call the auth interceptor must leave alone: sign-in, refresh and the other public routes. */
export const ANONYMOUS = new HttpContextToken<boolean>(() => false);

export const anonymous = (): { context: HttpContext } => ({ context: new HttpContext().set(ANONYMOUS, true) });
