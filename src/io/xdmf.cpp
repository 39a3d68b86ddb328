#include "io/xdmf.hpp"

#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <sstream>
#include <system_error>

#include "core/error.hpp"
#include "io/file_ops.hpp"
#include "io/h5read.hpp"

namespace tw::io {

namespace fs = std::filesystem;

namespace {

/// XML attribute value with the five special characters escaped.
std::string xml_escape(const std::string& s) {
  std::string out;
  for (char c : s) {
    switch (c) {
      case '&': out += "&amp;"; break;
      case '<': out += "&lt;"; break;
      case '>': out += "&gt;"; break;
      case '"': out += "&quot;"; break;
      case '\'': out += "&apos;"; break;
      default: out += c;
    }
  }
  return out;
}

std::string num(double v) {
  std::ostringstream s;
  s.precision(17);
  s << v;
  return s.str();
}

}  // namespace

std::string xdmf_path_for(const std::string& h5_path) {
  fs::path p(h5_path);
  p.replace_extension(".xmf");
  return p.string();
}

namespace {
std::string write_sidecar(const std::string& h5_path);
}

std::string write_xdmf_sidecar(const std::string& h5_path) {
  try {
    return write_sidecar(h5_path);
  } catch (const InputError& e) {
    // The run file was just written by us: a reading failure is a run failure, not bad input.
    throw RunError(std::string("cannot write the XDMF sidecar of '") + h5_path + "': " + e.what());
  }
}

namespace {

std::string write_sidecar(const std::string& h5_path) {
  const H5Reader r(h5_path);
  const std::string h5_name = fs::path(h5_path).filename().string();
  std::vector<hsize_t> face_dims;
  const std::vector<double> faces = r.read_real("/grid/x_faces", &face_dims);
  const std::vector<double> times = r.read_real("/snapshots/time");
  const std::size_t n_faces = faces.size();
  if (n_faces < 2) throw RunError("cannot write the XDMF sidecar of '" + h5_path + "': the grid has no cells");
  const std::size_t n_cells = n_faces - 1;
  const double height = (faces.back() - faces.front()) / 50;

  struct FieldRef {
    std::string name, units;
  };
  std::vector<FieldRef> fields;
  for (const auto& name : r.members("/snapshots")) {
    if (name == "time" || name == "step") continue;
    const std::string path = "/snapshots/" + name;
    std::vector<hsize_t> dims;
    if (!r.is_numeric(path)) continue;
    (void)r.read_real_rows(path, 0, 0, &dims);
    if (dims.size() != 2 || dims[1] != n_cells) continue;  // not a field over the cells
    fields.push_back({name, r.has_attribute(path, "units") ? r.attr_string(path, "units") : ""});
  }
  const std::string title = r.has_attribute("/", "title") ? r.attr_string("/", "title") : "";

  std::ostringstream x;
  x << "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
    << "<!DOCTYPE Xdmf SYSTEM \"Xdmf.dtd\" []>\n"
    << "<!-- Written by tubewave next to " << xml_escape(h5_name)
    << ": the snapshots as a strip of cells for XDMF viewers. -->\n"
    << "<Xdmf Version=\"3.0\">\n"
    << "  <Domain Name=\"" << xml_escape(title) << "\">\n"
    << "    <Grid Name=\"snapshots\" GridType=\"Collection\" CollectionType=\"Temporal\">\n";
  for (std::size_t k = 0; k < times.size(); ++k) {
    x << "      <Grid Name=\"snapshot " << k << "\" GridType=\"Uniform\">\n"
      << "        <Time Value=\"" << num(times[k]) << "\"/>\n"
      << "        <Topology TopologyType=\"2DRectMesh\" Dimensions=\"2 " << n_faces << "\"/>\n"
      << "        <Geometry GeometryType=\"VXVY\">\n"
      << "          <DataItem Dimensions=\"" << n_faces << "\" NumberType=\"Float\" Precision=\"8\" Format=\"HDF\">"
      << xml_escape(h5_name) << ":/grid/x_faces</DataItem>\n"
      << "          <DataItem Dimensions=\"2\" NumberType=\"Float\" Precision=\"8\" Format=\"XML\">0 " << num(height)
      << "</DataItem>\n"
      << "        </Geometry>\n";
    for (const auto& f : fields) {
      x << "        <Attribute Name=\"" << xml_escape(f.name) << "\" AttributeType=\"Scalar\" Center=\"Cell\">\n"
        << "          <Information Name=\"units\" Value=\"" << xml_escape(f.units) << "\"/>\n"
        << "          <DataItem ItemType=\"HyperSlab\" Dimensions=\"1 " << n_cells << "\" Type=\"HyperSlab\">\n"
        << "            <DataItem Dimensions=\"3 2\" NumberType=\"UInt\" Format=\"XML\">" << k << " 0 1 1 1 " << n_cells
        << "</DataItem>\n"
        << "            <DataItem Dimensions=\"" << times.size() << " " << n_cells
        << "\" NumberType=\"Float\" Precision=\"8\" Format=\"HDF\">" << xml_escape(h5_name) << ":/snapshots/"
        << xml_escape(f.name) << "</DataItem>\n"
        << "          </DataItem>\n"
        << "        </Attribute>\n";
    }
    x << "      </Grid>\n";
  }
  x << "    </Grid>\n  </Domain>\n</Xdmf>\n";

  const std::string out = xdmf_path_for(h5_path);
  write_text_file(out, x.str());
  return out;
}

}  // namespace

}  // namespace tw::io
