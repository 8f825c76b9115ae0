"""One bad case file per class of input mistake (shared by tests/test_bad_inputs.py and
benchmarks/bad_inputs_table.py, which writes docs/bad-inputs.md)."""

GOOD = """
[parameters]
W = 40
d = 12
[part]
thickness = 5
outline = [
  { x = 0, y = 0, edge = "bottom" },
  { x = 320, y = 0, edge = "right" },
  { x = 320, y = "W", edge = "top" },
  { x = 0, y = "W", edge = "left" },
]
[[part.cutouts]]
name = "hole"
shape = "circle"
center = [160, 20]
diameter = "d"
[load]
ends = ["left", "right"]
force = 1000
"""


def mutate(old: str, new: str) -> str:
    assert old in GOOD, old
    return GOOD.replace(old, new, 1)


#: (class of mistake, case text, words the message must contain)
BAD_CASES = [
    ("TOML syntax error", mutate("force = 1000", "force = = 1000"), "line"),
    ("unknown key", mutate("diameter = \"d\"", "diamter = \"d\""), "did you mean 'diameter'"),
    ("missing value", mutate("force = 1000", ""), "missing load"),
    ("mistyped value", mutate("thickness = 5", "thickness = [5]"), "thickness"),
    ("non-positive dimension", mutate("diameter = \"d\"", "diameter = \"d - 12\""), "positive"),
    ("unknown parameter", mutate("diameter = \"d\"", "diameter = \"dd\""), "did you mean 'd'"),
    ("circular parameters", mutate("d = 12", "d = \"W/3 + e\"\ne = \"d\""), "circular"),
    ("not simple arithmetic", mutate("diameter = \"d\"", "diameter = \"__import__('os')\""), "diameter"),
    ("self-intersecting outline", mutate("{ x = 320, y = 0, edge = \"right\" },\n  { x = 320, y = \"W\", edge = \"top\" },",
                                         "{ x = 320, y = \"W\", edge = \"right\" },\n  { x = 320, y = 0, edge = \"top\" },"),
     "not a simple closed curve"),
    ("cut-out outside the outline", mutate("center = [160, 20]", "center = [400, 20]"), "outside"),
    ("cut-out crossing the outline", mutate("center = [160, 20]", "center = [160, 36]"), "crosses"),
    ("cut-outs overlapping", GOOD + "[[part.cutouts]]\nname = \"hole2\"\nshape = \"circle\"\ncenter = [165, 20]\ndiameter = 12\n",
     "overlaps"),
    ("fillet does not fit", mutate("{ x = 320, y = \"W\", edge = \"top\" },", "{ x = 320, y = \"W\", edge = \"top\", fillet = 45 },"),
     "fillet"),
    ("notch deeper than the section", GOOD + "[[part.notches]]\nname = \"n\"\nedge = \"top\"\nposition = 80\ndepth = 45\nroot_radius = 2\n",
     "reaches through the part"),
    ("load with no resultant", mutate("force = 1000", "force = 0"), "zero"),
    ("load on an edge that does not exist", mutate("ends = [\"left\", \"right\"]", "ends = [\"left\", \"rigth\"]"), "rigth"),
    ("loaded ends not parallel", mutate("ends = [\"left\", \"right\"]", "ends = [\"left\", \"top\"]"), "not parallel"),
    ("unknown unit", "[units]\nlength = \"furlong\"\n" + GOOD, "furlong"),
    ("unknown output unit", "[units]\noutput = \"bar,mm\"\n" + GOOD, "units.output: unknown unit 'bar'"),
    ("yield strength above the ultimate strength", GOOD + "[material]\nyield_strength = 700\nultimate_strength = 600\n",
     "material.yield_strength"),
    ("fatigue cycle given two ways", GOOD + "[cycle]\nmax_factor = 1\nmin_factor = 0\nmean_factor = 0.5\n",
     "cycle.mean_factor"),
]
