# Writes OUTPUT, a C++ source that defines rungs::emit::builtin_templates() from every
# *.tmpl file in TEMPLATE_DIR. Run at build time, so editing a template rebuilds.
file(GLOB templates "${TEMPLATE_DIR}/*.tmpl")
list(SORT templates)
set(body "")
foreach(path IN LISTS templates)
  get_filename_component(name "${path}" NAME_WE)
  file(READ "${path}" text)
  string(APPEND body "      {\"${name}\", R\"rungs_template(${text})rungs_template\"},\n")
endforeach()
file(WRITE "${OUTPUT}.tmp"
"// Generated from templates/*.tmpl by cmake/embed_templates.cmake; do not edit.
#include \"6_emit/templates.h\"

namespace rungs::emit {

const TemplateSet& builtin_templates() {
  static const TemplateSet templates = {
${body}  };
  return templates;
}

}  // namespace rungs::emit
")
file(COPY_FILE "${OUTPUT}.tmp" "${OUTPUT}" ONLY_IF_DIFFERENT)
