// Square section of a kiln door: a castable lining on the kiln side (x = 0), an
// insulating fibre board and a steel door plate, with a stainless stud welded to the
// plate and reaching into the castable. Lengths in metres (invented dimensions).
SetFactory("OpenCASCADE");

side = 0.36;             // section side in y and z
castable = 0.125;        // castable lining thickness
board = 0.065;           // fibre board thickness
plate = 0.008;           // steel door plate thickness
stud_diameter = 0.010;   // round stud
stud_gap = 0.04;         // from the kiln face to the stud tip
eps = 1e-6;

r = stud_diameter / 2;
yc = side / 2;
zc = side / 2;
x_board = castable;
x_plate = castable + board;
x_out = x_plate + plate;

Box(1) = {0, 0, 0, castable, side, side};
Box(2) = {x_board, 0, 0, board, side, side};
Box(3) = {x_plate, 0, 0, plate, side, side};
Cylinder(4) = {stud_gap, yc, zc, x_plate - stud_gap, 0, 0, r};
BooleanFragments{ Volume{1, 2, 3, 4}; Delete; }{}

stud() = Volume In BoundingBox{stud_gap - eps, yc - r - eps, zc - r - eps, x_plate + eps, yc + r + eps, zc + r + eps};
castable_part() = Volume In BoundingBox{-eps, -eps, -eps, x_board + eps, side + eps, side + eps};
castable_part() -= stud();
board_part() = Volume In BoundingBox{x_board - eps, -eps, -eps, x_plate + eps, side + eps, side + eps};
board_part() -= stud();
plate_part() = Volume In BoundingBox{x_plate - eps, -eps, -eps, x_out + eps, side + eps, side + eps};

Physical Volume("castable", 1) = {castable_part()};
Physical Volume("board", 2) = {board_part()};
Physical Volume("plate", 3) = {plate_part()};
Physical Volume("stud", 4) = {stud()};

Physical Surface("kiln_face", 11) = Surface In BoundingBox{-eps, -eps, -eps, eps, side + eps, side + eps};
Physical Surface("outer_face", 12) = Surface In BoundingBox{x_out - eps, -eps, -eps, x_out + eps, side + eps, side + eps};
