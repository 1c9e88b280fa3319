// The local identity provider's demo accounts (scripts/local-idp.mjs), also read by the tests.

export const LOCAL_IDP_PASSWORD = "aldermere-idp-2026";

// Fictional people of the fictional Aldermere Institute of Technology, under the reserved `.test`
// domain (RFC 2606). `department` carries the department's code as the demo data spells it
// (scripts/demo-data.ts); `groups` the directory groups OIDC_GROUP_ROLES can map to roles.
export const LOCAL_IDP_ACCOUNTS = [
  {
    sub: "ait-70412",
    login: "nhalvorsen",
    name: "Noor Halvorsen",
    email: "n.halvorsen@aldermere.test",
    department: "PHYS",
    groups: ["staff", "hv-demonstrators"],
  },
  {
    sub: "ait-70988",
    login: "treyne",
    name: "Tobias Reyne",
    email: "t.reyne@aldermere.test",
    department: "OUTR",
    groups: ["staff", "hv-safety-office"],
  },
  {
    sub: "ait-71305",
    login: "ebrandt",
    name: "Elif Brandt",
    email: "e.brandt@aldermere.test",
    department: "PHYS",
    groups: ["staff", "dept-safety-contacts"],
  },
];
