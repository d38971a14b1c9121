#include "core/symmetry/cif_setting.h"

#include <map>

#include "core/elements/elements.h"

namespace nucleate::symmetry {

structure::io::SymmetrizedCrystal SymmetrisedForCif(const structure::Crystal& crystal,
                                                    double symprec, double angle_tolerance) {
  const StandardSetting setting = StandardSettingForCif(crystal, symprec, angle_tolerance);
  structure::io::SymmetrizedCrystal out;
  out.label = crystal.label;
  out.lattice = setting.cell.lattice;
  out.space_group_number = setting.info.number;
  out.hm_symbol = setting.info.international;
  out.operations = setting.info.operations;
  std::map<int, int> running;  // per element, for the site labels
  for (const AsymmetricSite& site : setting.asymmetric_unit) {
    structure::io::SymmetrizedSite written;
    written.number = site.number;
    written.label = std::string(elements::FindElement(site.number)->symbol) +
                    std::to_string(++running[site.number]);
    written.frac = site.frac;
    written.multiplicity = site.multiplicity;
    written.wyckoff = std::string(1, site.wyckoff);
    out.sites.push_back(written);
  }
  return out;
}

}  // namespace nucleate::symmetry
