// Steel angle bracket bolted to the flange of a hot duct, written out as STEP
// (bracket.step, millimetres). Run once: gmsh make_bracket.geo -parse_and_exit
//
// An equal-width angle: the flange leg (80 high, 6 thick) is bolted flat against the
// duct flange at x = 0 through two holes; the outstanding leg (60 long, 6 thick) lies
// along x at the bottom; a triangular gusset in the middle of the width stiffens the
// corner. Lengths in millimetres.
SetFactory("OpenCASCADE");

width = 100;         // along y
flange_height = 80;  // flange leg, along z
leg_length = 60;     // outstanding leg, along x
thickness = 6;       // both legs and the gusset
hole_diameter = 11;  // bolt clearance holes in the flange leg
hole_height = 50;    // hole centres above the outstanding leg's underside
hole_pitch = 50;     // between the two holes, centred on the width
gusset_reach = 45;   // along each leg from the inner corner

Box(1) = {0, 0, 0, thickness, width, flange_height};
Box(2) = {0, 0, 0, leg_length, width, thickness};

// Gusset: a right triangle in the x-z plane, sunk 3 mm into both legs, 6 mm thick.
sink = 3;
y_gusset = (width - thickness) / 2;
Point(101) = {thickness - sink, y_gusset, thickness - sink};
Point(102) = {thickness + gusset_reach, y_gusset, thickness - sink};
Point(103) = {thickness - sink, y_gusset, thickness + gusset_reach};
Line(101) = {101, 102};
Line(102) = {102, 103};
Line(103) = {103, 101};
Curve Loop(101) = {101, 102, 103};
Plane Surface(101) = {101};
gusset[] = Extrude {0, thickness, 0} { Surface{101}; };

Cylinder(4) = {-1, (width - hole_pitch) / 2, hole_height, thickness + 2, 0, 0, hole_diameter / 2};
Cylinder(5) = {-1, (width + hole_pitch) / 2, hole_height, thickness + 2, 0, 0, hole_diameter / 2};

BooleanUnion(10) = { Volume{1}; Delete; }{ Volume{2, gusset[1]}; Delete; };
BooleanDifference(11) = { Volume{10}; Delete; }{ Volume{4, 5}; Delete; };

Save "bracket.step";
