// GDAL loaded when a raster is first read or written, not when the program starts.
//
// GDAL brings about 110 shared libraries (PROJ, the image codecs, the database clients...).
// Linked into the program, the dynamic linker maps and relocates all of them at every start,
// whether or not the model has a raster: measured on the development machine (2 cores, load
// 2 to 5), a do-nothing program linked with libgdal alone took 0.13 s of CPU and 0.38 s wall,
// and the program's own start-up (`aquiledger --version`) 0.41 s of CPU, a tenth of a
// 300 x 300 switching run (docs/performance.md, "Seventh pass").
//
// So the program is not linked with GDAL. This file defines the GDAL C functions that
// raster_file.cpp and geotiff_fields.cpp call, with the declarations of GDAL's own headers
// (the compiler checks every signature); each opens the GDAL library on first use (dlopen,
// POSIX) and calls the function of that name in it. A program that also links GDAL itself
// (the raster tests, which write their inputs with it) gets the same library back from
// dlopen, so there is still one GDAL in the process.
#include <cpl_error.h>
#include <dlfcn.h>
#include <gdal.h>
#include <ogr_srs_api.h>

#include <stdexcept>
#include <string>

#ifndef AQUILEDGER_GDAL_LIBRARY
#define AQUILEDGER_GDAL_LIBRARY "libgdal.so"
#endif

namespace aquiledger {
namespace {

/// The address of GDAL's function `name`; the library is opened once (RTLD_GLOBAL: GDAL's
/// drivers and PROJ find its symbols as when linked). Throws when the library or the
/// function is missing, naming both.
void* gdal_library_symbol(const char* name) {
  static void* const library = dlopen(AQUILEDGER_GDAL_LIBRARY, RTLD_NOW | RTLD_GLOBAL);
  if (library == nullptr)
    throw std::runtime_error(std::string("cannot load the GDAL library (") +
                             AQUILEDGER_GDAL_LIBRARY + ") that rasters are read and written with");
  void* symbol = dlsym(library, name);
  if (symbol == nullptr)
    throw std::runtime_error(std::string("the GDAL library (") + AQUILEDGER_GDAL_LIBRARY +
                             ") has no function " + name);
  return symbol;
}

}  // namespace
}  // namespace aquiledger

// One forwarder per function: the declaration from GDAL's header is the type of the pointer.
#define AQUILEDGER_GDAL_FORWARD(ret, name, params, args)                             \
  extern "C" ret name params {                                                       \
    static const auto function =                                                     \
        reinterpret_cast<decltype(&::name)>(aquiledger::gdal_library_symbol(#name)); \
    return function args;                                                            \
  }

AQUILEDGER_GDAL_FORWARD(void, GDALAllRegister, (void), ())
AQUILEDGER_GDAL_FORWARD(GDALDatasetH, GDALOpen, (const char* file, GDALAccess access),
                        (file, access))
AQUILEDGER_GDAL_FORWARD(void, GDALClose, (GDALDatasetH ds), (ds))
AQUILEDGER_GDAL_FORWARD(int, GDALGetRasterCount, (GDALDatasetH ds), (ds))
AQUILEDGER_GDAL_FORWARD(GDALRasterBandH, GDALGetRasterBand, (GDALDatasetH ds, int band), (ds, band))
AQUILEDGER_GDAL_FORWARD(CPLErr, GDALGetGeoTransform, (GDALDatasetH ds, double* transform),
                        (ds, transform))
AQUILEDGER_GDAL_FORWARD(int, GDALGetRasterXSize, (GDALDatasetH ds), (ds))
AQUILEDGER_GDAL_FORWARD(int, GDALGetRasterYSize, (GDALDatasetH ds), (ds))
AQUILEDGER_GDAL_FORWARD(OGRSpatialReferenceH, GDALGetSpatialRef, (GDALDatasetH ds), (ds))
AQUILEDGER_GDAL_FORWARD(CPLErr, GDALRasterIO,
                        (GDALRasterBandH band, GDALRWFlag flag, int x, int y, int nx, int ny,
                         void* buffer, int buffer_nx, int buffer_ny, GDALDataType type,
                         int pixel_space, int line_space),
                        (band, flag, x, y, nx, ny, buffer, buffer_nx, buffer_ny, type, pixel_space,
                         line_space))
AQUILEDGER_GDAL_FORWARD(double, GDALGetRasterNoDataValue, (GDALRasterBandH band, int* has),
                        (band, has))
AQUILEDGER_GDAL_FORWARD(GDALDriverH, GDALGetDriverByName, (const char* name), (name))
AQUILEDGER_GDAL_FORWARD(GDALDatasetH, GDALCreate,
                        (GDALDriverH driver, const char* file, int nx, int ny, int bands,
                         GDALDataType type, CSLConstList options),
                        (driver, file, nx, ny, bands, type, options))
AQUILEDGER_GDAL_FORWARD(CPLErr, GDALSetGeoTransform, (GDALDatasetH ds, double* transform),
                        (ds, transform))
AQUILEDGER_GDAL_FORWARD(CPLErr, GDALSetSpatialRef, (GDALDatasetH ds, OGRSpatialReferenceH srs),
                        (ds, srs))
AQUILEDGER_GDAL_FORWARD(CPLErr, GDALSetRasterNoDataValue, (GDALRasterBandH band, double value),
                        (band, value))
AQUILEDGER_GDAL_FORWARD(void, GDALSetDescription, (GDALMajorObjectH object, const char* text),
                        (object, text))
AQUILEDGER_GDAL_FORWARD(const char*, CPLGetLastErrorMsg, (void), ())
AQUILEDGER_GDAL_FORWARD(CPLErrorHandler, CPLSetErrorHandler, (CPLErrorHandler handler), (handler))
AQUILEDGER_GDAL_FORWARD(void, CPLQuietErrorHandler,
                        (CPLErr type, CPLErrorNum number, const char* text), (type, number, text))
AQUILEDGER_GDAL_FORWARD(CPLErr, CPLGetLastErrorType, (void), ())
AQUILEDGER_GDAL_FORWARD(void, CPLErrorReset, (void), ())
AQUILEDGER_GDAL_FORWARD(OGRSpatialReferenceH, OSRNewSpatialReference, (const char* wkt), (wkt))
AQUILEDGER_GDAL_FORWARD(OGRErr, OSRImportFromEPSG, (OGRSpatialReferenceH srs, int code),
                        (srs, code))
AQUILEDGER_GDAL_FORWARD(void, OSRDestroySpatialReference, (OGRSpatialReferenceH srs), (srs))
AQUILEDGER_GDAL_FORWARD(int, OSRIsSame, (OGRSpatialReferenceH a, OGRSpatialReferenceH b), (a, b))
AQUILEDGER_GDAL_FORWARD(const char*, OSRGetName, (OGRSpatialReferenceH srs), (srs))
AQUILEDGER_GDAL_FORWARD(const char*, OSRGetAuthorityName,
                        (OGRSpatialReferenceH srs, const char* key), (srs, key))
AQUILEDGER_GDAL_FORWARD(const char*, OSRGetAuthorityCode,
                        (OGRSpatialReferenceH srs, const char* key), (srs, key))
