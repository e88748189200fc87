"""Post-processing of wallrans runs: shared by the commands in tools/post/ (plots, wall spacing,
profile comparison, verification report). Python with Debian's numpy, matplotlib, h5py, vtk9 and
yaml only (run with /usr/bin/python3)."""
