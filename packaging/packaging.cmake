# Install rules and the Debian package (CPack DEB): the binary, the lode(1)
# manual generated from the help text, bash and zsh completion, the systemd
# unit with its system user, and the documentation.
#
#   cmake --build build -j2 && sudo cmake --install build   # into /usr/local
#   cd build && cpack -G DEB                                 # lode_<version>_<arch>.deb
include(GNUInstallDirs)
find_package(Python3 REQUIRED COMPONENTS Interpreter)

set(LODE_MAN_PAGE ${CMAKE_BINARY_DIR}/lode.1.gz)
add_custom_command(OUTPUT ${LODE_MAN_PAGE}
  COMMAND ${Python3_EXECUTABLE} ${PROJECT_SOURCE_DIR}/packaging/gen_man.py $<TARGET_FILE:lode>
          ${PROJECT_VERSION} ${LODE_MAN_PAGE}
  DEPENDS lode ${PROJECT_SOURCE_DIR}/packaging/gen_man.py
  COMMENT "Writing the lode(1) manual page from the help text")
add_custom_target(lode_man ALL DEPENDS ${LODE_MAN_PAGE})

install(TARGETS lode RUNTIME DESTINATION ${CMAKE_INSTALL_BINDIR})
install(FILES ${LODE_MAN_PAGE} DESTINATION ${CMAKE_INSTALL_MANDIR}/man1)
install(FILES packaging/lode.bash DESTINATION ${CMAKE_INSTALL_DATADIR}/bash-completion/completions
        RENAME lode)
install(FILES packaging/_lode DESTINATION ${CMAKE_INSTALL_DATADIR}/zsh/vendor-completions)
# Under the prefix (/usr/lib/systemd/system in the package; Debian 12 merges /usr).
install(FILES packaging/lode.service DESTINATION lib/systemd/system)
install(FILES README.md DESTINATION ${CMAKE_INSTALL_DOCDIR})
install(FILES LICENSE DESTINATION ${CMAKE_INSTALL_DOCDIR} RENAME copyright)
install(FILES docs/api.md docs/evaluation.md docs/explore.md docs/formats.md docs/index-format.md
              docs/json-output.md docs/openapi.yaml docs/ranking.md docs/stopwords.md
        DESTINATION ${CMAKE_INSTALL_DOCDIR}/docs)
install(FILES packaging/config.example DESTINATION ${CMAKE_INSTALL_DOCDIR}/examples RENAME config)

set(CPACK_GENERATOR DEB)
set(CPACK_PACKAGE_NAME lode)
set(CPACK_PACKAGE_VERSION ${PROJECT_VERSION})
set(CPACK_PACKAGE_CONTACT "lode authors <lode@localhost>")
set(CPACK_PACKAGE_DESCRIPTION_SUMMARY "local full-text search with ranked, explainable results")
set(CPACK_PACKAGE_DESCRIPTION
    "lode indexes a folder of documents in one SQLite file, ranks with BM25 or TF-IDF and shows each score term by term, from the shell, over a read-only HTTP API and a browser page.")
set(CPACK_PACKAGING_INSTALL_PREFIX /usr)
set(CPACK_STRIP_FILES ON)
set(CPACK_DEBIAN_FILE_NAME DEB-DEFAULT)
set(CPACK_DEBIAN_PACKAGE_SECTION utils)
set(CPACK_DEBIAN_PACKAGE_SHLIBDEPS ON)  # library dependencies from dpkg-shlibdeps
set(CPACK_DEBIAN_PACKAGE_DEPENDS "adduser")
set(CPACK_DEBIAN_PACKAGE_CONTROL_EXTRA ${PROJECT_SOURCE_DIR}/packaging/postinst)
set(CPACK_DEBIAN_PACKAGE_CONTROL_STRICT_PERMISSION ON)
include(CPack)
