#pragma once
/// The XDMF sidecar of a run file: RUN.xmf next to RUN.h5, so general-purpose viewers
/// that read XDMF (an open standard: XML describing a mesh and pointing at HDF5 datasets)
/// open the snapshots without knowing tubewave's layout.
///
/// What it describes: a temporal collection with one grid per snapshot. The tube is drawn
/// as a strip one cell row high: a 2DRectMesh whose x nodes are /grid/x_faces and whose y
/// nodes are 0 and a fiftieth of the tube length (so it is visible), with every snapshot
/// field as a cell-centred scalar read from /snapshots/FIELD through a hyperslab of its
/// row. Units go into an Information element of each attribute. Paths inside the XML name
/// the .h5 file by its base name, so the two files can be moved together.
///
/// Written atomically (RUN.xmf.tmp.<pid>, then renamed). Errors are RunError.
#include <string>

namespace tw::io {

/// The sidecar path of a run file: the same name with the extension .xmf.
[[nodiscard]] std::string xdmf_path_for(const std::string& h5_path);

/// Read the run file's layout (grid, snapshot times and fields with their units) and write
/// its sidecar. Returns the sidecar's path.
std::string write_xdmf_sidecar(const std::string& h5_path);

}  // namespace tw::io
