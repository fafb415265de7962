import { describe, expect, test } from "vitest";
import { passwordProblem, PASSWORD_MIN } from "@/lib/security/password";

// Password rules of issue 11 §1, checked with zxcvbn-ts (the estimator of Wheeler 2016, USENIX Security) and the
// common-password list its language-common package ships.
describe("password rules", () => {
  test("shorter than 12 characters is refused with the count", () => {
    expect(passwordProblem("Tr4il-gos")).toBe(`Use at least ${PASSWORD_MIN} characters (yours has 9); a passphrase of three or four unrelated words is easy to remember.`);
  });
  test("a password that is on the common-password list is refused as such", () => {
    // "123456789012" and "qwertyuiop123"-style strings are on every leaked-password list; the first is whole in it.
    expect(passwordProblem("123456789012")).toMatch(/on a list of commonly used passwords/);
  });
  test("a common password with digits appended is too easy to guess, naming the parts", () => {
    expect(passwordProblem("password1234")).toBe('This password is too easy to guess (it is built from common words, names or patterns: "password", "1234"); make it longer or use unrelated words.');
    expect(passwordProblem("football2024")).toMatch(/too easy to guess/);
  });
  test("the user's own name or e-mail does not make a password", () => {
    expect(passwordProblem("priyaraman12", ["priya.raman@lab.example", "Priya Raman"])).toMatch(/too easy to guess/);
  });
  test("a passphrase of unrelated words and a long mixed password are accepted", () => {
    expect(passwordProblem("outcrop lantern meadow kettle")).toBeNull();
    expect(passwordProblem("Tr4il-gossan-quartz")).toBeNull();
  });
});
