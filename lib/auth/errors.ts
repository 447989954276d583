import { CredentialsSignin } from "next-auth";

/** Auth.js puts `code` in the redirect URL, so codes say nothing about which part was wrong. */
export class InvalidSignIn extends CredentialsSignin {
  code = "invalid";
}
export class ThrottledSignIn extends CredentialsSignin {
  code = "throttled";
}

export const SIGN_IN_MESSAGES: Record<string, string> = {
  invalid: "That e-mail and password do not match an active Kinarc account.",
  throttled: "Too many failed attempts. Wait 15 minutes and try again, or ask your clinic admin to reset your password.",
};
