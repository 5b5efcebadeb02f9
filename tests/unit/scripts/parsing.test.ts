// Small parsers of the run scripts: .env files, mail subjects, links in stored mail.
import { describe, expect, test } from "vitest";
import { parseDotEnv } from "@/scripts/env";
import { decodeEncodedWords, subjectOf } from "@/scripts/mail-sink";
import { linksIn } from "@/tests/e2e/support/mail";

describe("parseDotEnv", () => {
  test("reads assignments, comments, export, quotes", () => {
    const env = parseDotEnv(
      ["# comment", "", "PORT=3001", "export SMTP_HOST = mail.example", 'MAIL_FROM="Tributary <a@b.c>"', "A='x # y'", "B=plain # note", "not a line"].join("\n"),
    );
    expect(env).toEqual({ PORT: "3001", SMTP_HOST: "mail.example", MAIL_FROM: "Tributary <a@b.c>", A: "x # y", B: "plain" });
  });
});

describe("subjectOf", () => {
  test("plain, folded and encoded subjects", () => {
    expect(subjectOf("From: a@b\r\nSubject: Hello there\r\n\r\nSubject: not this")).toBe("Hello there");
    expect(subjectOf("Subject: a long\r\n  folded line\r\nTo: x\r\n\r\nbody")).toBe("a long folded line");
    expect(subjectOf("To: x\n\nno subject")).toBe("");
    expect(subjectOf("Subject: =?UTF-8?Q?Invitation_=C3=A0_Tributary?=\r\n\r\n")).toBe("Invitation à Tributary");
  });

  test("adjacent encoded words join without the space between them", () => {
    expect(decodeEncodedWords("=?UTF-8?B?Sm9pbiDigJxOb3J0aA==?= =?UTF-8?B?IEZvcmvigJ0=?=")).toBe("Join “North Fork”");
    expect(decodeEncodedWords("plain =?ISO-8859-1?Q?caf=E9?= text")).toBe("plain café text");
  });
});

test("linksIn undoes quoted-printable soft breaks", () => {
  const raw = "Content-Transfer-Encoding: quoted-printable\r\n\r\nOpen http://localhost:3100/invite/abc=\r\ndef?x=3D1 to join.\r\n";
  expect(linksIn(raw)).toEqual(["http://localhost:3100/invite/abcdef?x=1"]);
});
