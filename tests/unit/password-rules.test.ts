import { describe, expect, it } from "vitest";
import { hashPassword } from "@/lib/auth/password";
import { passwordRuleProblem } from "@/lib/auth/password-rules";

const check = (password: string, earlierHashes: string[] = []) => passwordRuleProblem({ password, email: "amara.osei@clinic.example", earlierHashes });

describe("the password rules for a person's own password", () => {
  it("refuses fewer than 12 characters", async () => {
    expect(await check("Tr0ub4dor&3")).toBe("The password must have at least 12 characters."); // 11 characters
    expect(await check("Tr0ub4dor&3x")).toBeNull();
  });

  it("refuses a password from the common-password list, whatever its case and trailing digits", async () => {
    // "qwerty123456" and "password" are on zxcvbn-ts's passwords-common list (checked against the package).
    expect(await check("QWERTY123456")).toBe("That password is on a list of commonly used passwords; choose another.");
    expect(await check("Password1234567")).toBe("That password is on a list of commonly used passwords; choose another.");
  });

  it("refuses a password containing the name part of the e-mail address", async () => {
    expect(await check("my-Amara.Osei-pass")).toBe("The password must not contain the name part of your e-mail address.");
  });

  it("refuses one of the earlier passwords it is given", async () => {
    const earlier = [await hashPassword("kettle on the north wall"), await hashPassword("steam at one two one")];
    expect(await check("steam at one two one", earlier)).toBe("The password must differ from your last 5 passwords.");
    expect(await check("a fresh river of lilac", earlier)).toBeNull();
  });
});
