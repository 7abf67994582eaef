import { ZxcvbnFactory } from "@zxcvbn-ts/core";
import * as common from "@zxcvbn-ts/language-common";
import * as en from "@zxcvbn-ts/language-en";
import { AppError } from "../http/errors";

// NIST SP 800-63B §5.1.1.2: refuse passwords found in lists of commonly used or compromised values and
// context-specific words (the user name); no composition rules. zxcvbn-ts estimates guessability from
// its maintained frequency lists (common passwords, English words and names, keyboard patterns,
// repeats, dates) with the person's own e-mail and name as extra words.
const zxcvbn = new ZxcvbnFactory({
  dictionary: { ...common.dictionary, ...en.dictionary },
  graphs: common.adjacencyGraphs,
  translations: en.translations,
});

/** zxcvbn's score 3: "safely unguessable: moderate protection from an offline slow-hash scenario". */
export const MIN_PASSWORD_SCORE = 3;

/** Refuses (400 weak_password, on the password field) a password that is common or made of the person's own e-mail or name. */
export async function assertStrongPassword(password: string, person: { email: string; name?: string }) {
  const email = person.email.trim().toLowerCase();
  const words = [email, email.split("@")[0], ...(person.name ? person.name.toLowerCase().split(/\s+/) : [])].filter((w) => w.length >= 3);
  const lowered = password.trim().toLowerCase();
  const sameAsEmail = lowered === email || lowered === email.split("@")[0];
  const result = sameAsEmail ? null : await zxcvbn.checkAsync(password, words);
  if (sameAsEmail || (result && result.score < MIN_PASSWORD_SCORE)) {
    const why = sameAsEmail
      ? "it is the person's own e-mail address"
      : (result!.feedback.warning ?? "it is among the passwords attackers try first");
    const message = `Choose another password: ${why.replace(/\.$/, "").replace(/^./, (c) => c.toLowerCase())}. A few unrelated words make a strong one.`;
    throw new AppError("weak_password", 400, message, [{ code: "custom", path: ["password"], message }]);
  }
}
