// Square section of a furnace wall: refractory lining, insulating backup board and a
// steel shell stacked in x from the hot face (x = 0), with a round steel anchor welded
// to the shell and reaching into the lining. Lengths in metres.
SetFactory("OpenCASCADE");

width = 0.6;              // section side in y and z
lining = 0.20;            // refractory lining thickness
backup = 0.10;            // insulating backup board thickness
shell = 0.006;            // steel shell thickness
anchor_diameter = 0.012;  // round anchor rod
anchor_gap = 0.05;        // from the hot face to the anchor tip
eps = 1e-6;

r = anchor_diameter / 2;
yc = width / 2;
zc = width / 2;
x_backup = lining;
x_shell = lining + backup;
x_cold = x_shell + shell;

Box(1) = {0, 0, 0, lining, width, width};
Box(2) = {x_backup, 0, 0, backup, width, width};
Box(3) = {x_shell, 0, 0, shell, width, width};
// The anchor runs from the inner face of the shell to anchor_gap from the hot face.
Cylinder(4) = {anchor_gap, yc, zc, x_shell - anchor_gap, 0, 0, r};

// Cut the layers around the anchor (and the anchor at the lining/backup interface)
// so that all volumes share their faces.
BooleanFragments{ Volume{1, 2, 3, 4}; Delete; }{}

anchor() = Volume In BoundingBox{anchor_gap - eps, yc - r - eps, zc - r - eps, x_shell + eps, yc + r + eps, zc + r + eps};
lining_part() = Volume In BoundingBox{-eps, -eps, -eps, x_backup + eps, width + eps, width + eps};
lining_part() -= anchor();
backup_part() = Volume In BoundingBox{x_backup - eps, -eps, -eps, x_shell + eps, width + eps, width + eps};
backup_part() -= anchor();
shell_part() = Volume In BoundingBox{x_shell - eps, -eps, -eps, x_cold + eps, width + eps, width + eps};

Physical Volume("lining", 1) = {lining_part()};
Physical Volume("backup", 2) = {backup_part()};
Physical Volume("shell", 3) = {shell_part()};
Physical Volume("anchor", 4) = {anchor()};

Physical Surface("hot_face", 11) = Surface In BoundingBox{-eps, -eps, -eps, eps, width + eps, width + eps};
Physical Surface("cold_face", 12) = Surface In BoundingBox{x_cold - eps, -eps, -eps, x_cold + eps, width + eps, width + eps};
// Cross-section of the anchor where it passes from the backup into the lining.
Physical Surface("anchor_cut", 13) = Surface In BoundingBox{x_backup - eps, yc - r - eps, zc - r - eps, x_backup + eps, yc + r + eps, zc + r + eps};
