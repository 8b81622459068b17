import { describe, expect, it } from "vitest";
import { effectiveRole, hasRole, roles } from "@/lib/roles";

describe("roles", () => {
  it("orders roles so each includes the ones before it (PRODUCT.md role table)", () => {
    expect(roles).toEqual(["visitor", "supporter", "member", "host", "admin"]);
    expect(hasRole("admin", "host")).toBe(true);
    expect(hasRole("host", "host")).toBe(true);
    expect(hasRole("member", "host")).toBe(false);
    expect(hasRole("supporter", "member")).toBe(false);
    expect(hasRole("visitor", "supporter")).toBe(false);
  });

  it("derives member from an active membership, and only for supporters", () => {
    expect(effectiveRole("supporter", true)).toBe("member");
    expect(effectiveRole("supporter", false)).toBe("supporter");
    expect(effectiveRole("host", true)).toBe("host");
  });
});
