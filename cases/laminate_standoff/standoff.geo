// A laminated standoff block between a hot platen and a cooled mounting plate
// (invented dimensions, millimetres): 120 long (x), 80 wide (y), 40 high (z).
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 120, 80, 40};
Physical Volume("block") = {1};
Physical Surface("platen_side") = {1};   // x = 0, against the hot platen
Physical Surface("mount_side") = {2};    // x = 120, against the mounting plate
Physical Surface("top") = {6};           // z = 40, open to the air
Physical Surface("bottom") = {5};        // z = 0, open to the air
