# Included by the top CMakeLists.txt after lode_component(server ...): embeds
# web/* and docs/openapi.yaml into lode_server at build time.
file(GLOB _lode_web CONFIGURE_DEPENDS ${PROJECT_SOURCE_DIR}/web/*)
set(_lode_embedded ${_lode_web} ${PROJECT_SOURCE_DIR}/docs/openapi.yaml)
string(REPLACE ";" "|" _lode_embedded_arg "${_lode_embedded}")
set(_lode_gen ${CMAKE_BINARY_DIR}/generated/server/embedded_files.cpp)
add_custom_command(OUTPUT ${_lode_gen}
  COMMAND ${CMAKE_COMMAND} -DOUT=${_lode_gen} -DFILES=${_lode_embedded_arg}
          -P ${PROJECT_SOURCE_DIR}/src/server/embed_files.cmake
  DEPENDS ${_lode_embedded} ${PROJECT_SOURCE_DIR}/src/server/embed_files.cmake
  COMMENT "Embedding web/ and docs/openapi.yaml"
  VERBATIM)
target_sources(lode_server PRIVATE ${_lode_gen})
