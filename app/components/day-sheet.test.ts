import { describe, expect, it } from "vitest";
import { roundScaleLength, signingDivers } from "./day-sheet";

describe("the day sheet's scale bar (computed: 1, 2 or 5 × a power of ten near a quarter of the width)", () => {
  it.each([
    [100, 20], // a quarter is 25: 20 is nearer than 50
    [80, 20],
    [400, 100],
    [1000, 200], // 250: 200 and 500 are 50 and 250 away
    [3.7, 1], // 0.925: 1 is nearest
  ])("across %d gives %d", (span, expected) => {
    expect(roundScaleLength(span)).toBe(expected);
  });
});

describe("who signs the day sheet as a diver (practice: divers and standby divers sign, tenders do not)", () => {
  const crew = [
    { name: "Odessa Marchetti", duty: "diver" },
    { name: "Caspian Holloway", duty: "tender" },
    { name: "Juniper Adeyemi", duty: "standby diver" },
  ];

  it("lists the team's divers, then the day's visitors once each", () => {
    expect(signingDivers(crew, ["Thaddeus Moorcroft", "Thaddeus Moorcroft"])).toEqual([
      { name: "Odessa Marchetti", visitor: false },
      { name: "Juniper Adeyemi", visitor: false },
      { name: "Thaddeus Moorcroft", visitor: true },
    ]);
  });

  it("lists everyone when no duty names diving (a roster without duties)", () => {
    expect(signingDivers([{ name: "A", duty: "" }, { name: "B", duty: "crew" }], [])).toEqual([{ name: "A", visitor: false }, { name: "B", visitor: false }]);
  });
});
