// Lining panel of the benchmark (tools/bench/bench_geometry.cpp) and of the end-to-end
// case beside it: a scenario of our own with invented dimensions, in metres.
// 1 m x 1 m; 200 mm of dense refractory on the hot face (z = 0), 200 mm of insulating
// board, a 50 mm steel shell, and a steel anchor of 80 mm diameter from 50 mm inside
// the refractory out through the shell. The layers and the anchor are fragmented into
// one conforming body; the regions are picked by bounding box, the anchor's pieces
// taken out of the layers' lists.
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 1, 1, 0.2};
Box(2) = {0, 0, 0.2, 1, 1, 0.2};
Box(3) = {0, 0, 0.4, 1, 1, 0.05};
Cylinder(4) = {0.5, 0.5, 0.05, 0, 0, 0.4, 0.04};
BooleanFragments{ Volume{1, 2, 3}; Delete; }{ Volume{4}; Delete; }
e = 1e-6;
anchor() = Volume In BoundingBox{0.46 - e, 0.46 - e, 0.05 - e, 0.54 + e, 0.54 + e, 0.45 + e};
refractory() = Volume In BoundingBox{-e, -e, -e, 1 + e, 1 + e, 0.2 + e};
board() = Volume In BoundingBox{-e, -e, 0.2 - e, 1 + e, 1 + e, 0.4 + e};
shell() = Volume In BoundingBox{-e, -e, 0.4 - e, 1 + e, 1 + e, 0.45 + e};
refractory() -= anchor();
board() -= anchor();
shell() -= anchor();
hot() = Surface In BoundingBox{-e, -e, -e, 1 + e, 1 + e, e};
cold() = Surface In BoundingBox{-e, -e, 0.45 - e, 1 + e, 1 + e, 0.45 + e};
Physical Volume("refractory") = {refractory()};
Physical Volume("board") = {board()};
Physical Volume("shell") = {shell()};
Physical Volume("anchor") = {anchor()};
Physical Surface("hot_face") = {hot()};
Physical Surface("cold_face") = {cold()};
