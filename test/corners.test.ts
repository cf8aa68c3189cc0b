import { describe, expect, it } from "vitest";
import { switchPoints } from "../src/solve/corners.js";

describe("switchPoints", () => {
  it("finds every sunrise and sunset of max(cos x, 0): x = π/2 + kπ (closed form)", () => {
    const found = switchPoints((x) => Math.max(Math.cos(x), 0), 0.1, 0.1 + 200 * Math.PI, 2000);
    expect(found.length).toBe(200);
    // Bisected to 1e-10 of |x| (beyond 1), its documented precision.
    found.forEach((x, k) => {
      const exact = Math.PI / 2 + k * Math.PI;
      expect(Math.abs(x - exact)).toBeLessThan(1e-10 * Math.max(1, exact));
    });
  });

  it("finds none where the function never changes between zero and positive", () => {
    expect(switchPoints((x) => 2 + Math.sin(x), 0, 10, 100).length).toBe(0);
    expect(switchPoints(() => 0, 0, 10, 100).length).toBe(0);
  });
});
